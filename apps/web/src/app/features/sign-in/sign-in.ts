import { HttpErrorResponse } from '@angular/common/http';
import {
  ChangeDetectionStrategy,
  Component,
  ElementRef,
  afterNextRender,
  inject,
  input,
  signal,
  viewChild,
} from '@angular/core';
import { FormGroupDirective, NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { Router } from '@angular/router';

import { apiErrorMessage } from '../../core/api/api-error';
import { Auth } from '../../core/auth/auth';
import { safeReturnUrl } from '../../core/auth/guards';

export const wrongCredentialsMessage = 'E-mail or password is wrong.';
export const rateLimitedMessage =
  'Too many sign-in attempts. Wait a few minutes, then try again.';

/** The message for a failed sign-in; the API's own text for anything unexpected. */
export function signInErrorMessage(error: unknown): string {
  if (!(error instanceof HttpErrorResponse)) return 'Signing in failed. Please try again.';
  if (error.status === 401) return wrongCredentialsMessage;
  if (error.status === 429) return rateLimitedMessage;
  return apiErrorMessage(error);
}

@Component({
  selector: 'fl-sign-in',
  imports: [
    ReactiveFormsModule,
    MatCardModule,
    MatFormFieldModule,
    MatInputModule,
    MatButtonModule,
    MatIconModule,
    MatProgressBarModule,
  ],
  templateUrl: './sign-in.html',
  styleUrl: './sign-in.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SignIn {
  private readonly auth = inject(Auth);
  private readonly router = inject(Router);

  /** Where to go afterwards; arrives from `?returnUrl=` through component input binding. */
  readonly returnUrl = input<string>();

  protected readonly form = inject(NonNullableFormBuilder).group({
    email: ['', [Validators.required, Validators.email]],
    password: ['', [Validators.required]],
  });
  protected readonly submitting = signal(false);
  protected readonly error = signal<string | null>(null);
  protected readonly passwordVisible = signal(false);

  private readonly emailInput = viewChild.required<ElementRef<HTMLInputElement>>('emailInput');
  private readonly formDirective = viewChild.required(FormGroupDirective);

  constructor() {
    afterNextRender(() => this.emailInput().nativeElement.focus());
  }

  protected async submit(): Promise<void> {
    if (this.submitting()) return;
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      this.focusFirstInvalid();
      return;
    }
    this.submitting.set(true);
    this.error.set(null);
    try {
      await this.auth.signIn(this.form.getRawValue());
      await this.router.navigateByUrl(safeReturnUrl(this.returnUrl()));
    } catch (error) {
      this.error.set(signInErrorMessage(error));
      // Clear the password and the form's submitted state, so the empty field is not flagged
      // as a mistake on top of the message above; the person types the password again.
      this.formDirective().resetForm({ email: this.form.controls.email.value, password: '' });
      document.getElementById('sign-in-password')?.focus();
    } finally {
      this.submitting.set(false);
    }
  }

  private focusFirstInvalid(): void {
    if (this.form.controls.email.invalid) {
      this.emailInput().nativeElement.focus();
    } else {
      document.getElementById('sign-in-password')?.focus();
    }
  }
}
