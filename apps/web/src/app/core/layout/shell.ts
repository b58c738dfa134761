import { BreakpointObserver } from '@angular/cdk/layout';
import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatDividerModule } from '@angular/material/divider';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatListModule } from '@angular/material/list';
import { MatMenuModule } from '@angular/material/menu';
import { MatSelectChange, MatSelectModule } from '@angular/material/select';
import { MatSidenavModule } from '@angular/material/sidenav';
import { MatSnackBar } from '@angular/material/snack-bar';
import { MatToolbarModule } from '@angular/material/toolbar';
import { Router, RouterLink, RouterLinkActive, RouterOutlet } from '@angular/router';
import { map } from 'rxjs';

import { Auth } from '../auth/auth';
import { roleLabels } from '../auth/roles';
import { NAV_ITEMS } from './nav-items';

/** The frame around every signed-in page: toolbar, role-aware navigation, main region. */
@Component({
  selector: 'fl-shell',
  imports: [
    RouterOutlet,
    RouterLink,
    RouterLinkActive,
    MatToolbarModule,
    MatSidenavModule,
    MatListModule,
    MatIconModule,
    MatButtonModule,
    MatMenuModule,
    MatSelectModule,
    MatFormFieldModule,
    MatDividerModule,
  ],
  templateUrl: './shell.html',
  styleUrl: './shell.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Shell {
  private readonly auth = inject(Auth);
  private readonly router = inject(Router);
  private readonly snackBar = inject(MatSnackBar);
  private readonly allNavItems = inject(NAV_ITEMS);

  protected readonly me = this.auth.me;
  protected readonly roleLabel = computed(() => {
    const me = this.me();
    return me ? roleLabels[me.role] : '';
  });
  protected readonly navItems = computed(() => {
    // Reading me() makes the list follow organisation switches.
    this.me();
    return this.allNavItems.filter((item) => !item.permission || this.auth.can(item.permission));
  });
  protected readonly hasSeveralOrganisations = computed(
    () => (this.me()?.organisations.length ?? 0) > 1,
  );
  protected readonly roleLabels = roleLabels;

  /** Narrow screens get an overlay drawer behind a menu button instead of a fixed column. */
  protected readonly narrow = toSignal(
    inject(BreakpointObserver)
      .observe('(max-width: 840px)')
      .pipe(map((state) => state.matches)),
    { initialValue: false },
  );

  protected async switchOrganisation(change: MatSelectChange<string>): Promise<void> {
    const previousId = this.me()?.organisation.id;
    if (change.value === previousId) return;
    try {
      const me = await this.auth.switchOrganisation(change.value);
      this.snackBar.open(`You are now working in ${me.organisation.name}.`, 'Close', { duration: 4000 });
      // The page in view belonged to the previous organisation and may not suit the new role.
      await this.router.navigateByUrl('/overview');
    } catch {
      // The error interceptor has told the person what went wrong; show the old choice again.
      change.source.value = previousId;
    }
  }

  protected async signOut(): Promise<void> {
    await this.auth.signOut();
    await this.router.navigateByUrl('/sign-in');
  }
}
