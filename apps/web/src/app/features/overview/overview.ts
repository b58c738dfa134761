import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { MatCardModule } from '@angular/material/card';
import { MatIconModule } from '@angular/material/icon';

import { Auth } from '../../core/auth/auth';
import { describePermission, roleLabels, roleSummaries } from '../../core/auth/roles';

/** Home after sign-in: where you are, who you are here, and what you may do. */
@Component({
  selector: 'fl-overview',
  imports: [MatCardModule, MatIconModule],
  templateUrl: './overview.html',
  styleUrl: './overview.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Overview {
  private readonly auth = inject(Auth);

  protected readonly me = this.auth.me;
  protected readonly roleLabel = computed(() => {
    const me = this.me();
    return me ? roleLabels[me.role] : '';
  });
  protected readonly roleSummary = computed(() => {
    const me = this.me();
    return me ? roleSummaries[me.role] : '';
  });
  protected readonly abilities = computed(() =>
    [...(this.me()?.permissions ?? [])].sort().map((permission) => ({
      permission,
      text: describePermission(permission),
    })),
  );
}
