import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressSpinnerModule } from '@angular/material/progress-spinner';
import { MatSortModule, Sort } from '@angular/material/sort';
import { MatTableModule } from '@angular/material/table';

import { Member, MembersApi } from '../../core/api/members-api';
import { roleLabels } from '../../core/auth/roles';

type MemberColumn = 'name' | 'email' | 'role' | 'joinedAt';

/** Keeps members whose name, e-mail or role (key or label) contains the text, ignoring case. */
export function filterMembers(members: readonly Member[], text: string): Member[] {
  const needle = text.trim().toLowerCase();
  if (!needle) return [...members];
  return members.filter((member) =>
    [member.name, member.email, member.role, roleLabels[member.role]].some((value) =>
      value.toLowerCase().includes(needle),
    ),
  );
}

/** Orders members by one column; a cleared sort keeps the API's order. */
export function sortMembers(members: readonly Member[], sort: Sort): Member[] {
  const sorted = [...members];
  if (!sort.direction) return sorted;
  const column = sort.active as MemberColumn;
  const key = (member: Member): string =>
    column === 'role' ? roleLabels[member.role] : String(member[column] ?? '');
  const direction = sort.direction === 'asc' ? 1 : -1;
  return sorted.sort((a, b) => key(a).localeCompare(key(b), undefined, { sensitivity: 'base' }) * direction);
}

@Component({
  selector: 'fl-members',
  imports: [
    DatePipe,
    MatTableModule,
    MatSortModule,
    MatFormFieldModule,
    MatInputModule,
    MatIconModule,
    MatProgressSpinnerModule,
  ],
  templateUrl: './members.html',
  styleUrl: './members.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Members {
  private readonly membersApi = inject(MembersApi);

  protected readonly columns: MemberColumn[] = ['name', 'email', 'role', 'joinedAt'];

  private readonly members = signal<Member[]>([]);
  protected readonly status = signal<'loading' | 'loaded' | 'failed'>('loading');
  protected readonly filter = signal('');
  protected readonly sort = signal<Sort>({ active: 'name', direction: 'asc' });

  protected readonly rows = computed(() =>
    sortMembers(filterMembers(this.members(), this.filter()), this.sort()),
  );
  protected readonly total = computed(() => this.members().length);

  constructor() {
    this.membersApi
      .list()
      .pipe(takeUntilDestroyed())
      .subscribe({
        next: (list) => {
          this.members.set(list.items);
          this.status.set('loaded');
        },
        // The error interceptor has shown the reason; the page says that nothing loaded.
        error: () => this.status.set('failed'),
      });
  }

  protected roleLabel(member: Member): string {
    return roleLabels[member.role];
  }

  protected onFilter(event: Event): void {
    this.filter.set((event.target as HTMLInputElement).value);
  }
}
