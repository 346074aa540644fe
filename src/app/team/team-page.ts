import { httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButton, MatIconButton } from '@angular/material/button';
import { MatCard, MatCardContent, MatCardHeader, MatCardTitle } from '@angular/material/card';
import { MatError, MatFormField, MatLabel } from '@angular/material/form-field';
import { MatIcon } from '@angular/material/icon';
import { MatInput } from '@angular/material/input';
import { MatProgressBar } from '@angular/material/progress-bar';
import { MatOption, MatSelect } from '@angular/material/select';
import { MatSnackBar } from '@angular/material/snack-bar';
import { MatTooltip } from '@angular/material/tooltip';
import { DatePipe } from '@angular/common';
import type { InvitationView, MemberView } from '../../../shared/projects';
import { PROJECT_ROLES, ROLE_LABELS, type ProjectRole } from '../../../shared/roles';
import { apiErrorMessage } from '../core/api-error';
import { AuthStore } from '../core/auth-store';
import { ProjectStore } from '../core/project-store';
import { TeamApi } from './team-api';

/** Who is in the project with which role; ecologists and admins invite and change roles. */
@Component({
  selector: 'mac-team-page',
  imports: [
    ReactiveFormsModule,
    DatePipe,
    MatCard,
    MatCardHeader,
    MatCardTitle,
    MatCardContent,
    MatFormField,
    MatLabel,
    MatError,
    MatInput,
    MatSelect,
    MatOption,
    MatButton,
    MatIconButton,
    MatIcon,
    MatProgressBar,
    MatTooltip,
  ],
  templateUrl: './team-page.html',
  styleUrl: './team-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class TeamPage {
  private readonly api = inject(TeamApi);
  private readonly snackBar = inject(MatSnackBar);
  private readonly store = inject(ProjectStore);
  private readonly auth = inject(AuthStore);
  protected readonly roles = PROJECT_ROLES.map((value) => ({ value, label: ROLE_LABELS[value] }));
  protected readonly project = this.store.current;
  protected readonly me = this.auth.user;
  protected readonly canManage = computed(() => this.store.can('ecologist') || this.auth.isAdmin());
  protected readonly members = httpResource<MemberView[]>(
    () => `/api/projects/${this.project()?.slug}/members`,
    {
      defaultValue: [],
    },
  );
  protected readonly invitations = httpResource<InvitationView[]>(
    () => (this.canManage() ? `/api/projects/${this.project()?.slug}/invitations` : undefined),
    { defaultValue: [] },
  );
  protected readonly busy = signal(false);
  protected readonly inviteError = signal<string | null>(null);
  protected readonly inviteForm = inject(NonNullableFormBuilder).group({
    email: ['', [Validators.required, Validators.email]],
    role: ['volunteer' as ProjectRole, Validators.required],
  });

  protected roleLabel(role: ProjectRole): string {
    return ROLE_LABELS[role];
  }

  protected async changeRole(member: MemberView, role: ProjectRole): Promise<void> {
    const slug = this.project()?.slug;
    if (!slug || role === member.role) return;
    try {
      this.members.set(await this.api.setRole(slug, member.userId, role));
      this.snackBar.open(`${member.name} is now ${ROLE_LABELS[role].toLowerCase()}.`, undefined, {
        duration: 3000,
      });
    } catch (err) {
      this.snackBar.open(apiErrorMessage(err), 'Dismiss', { duration: 6000 });
      this.members.reload();
    }
  }

  protected async removeMember(member: MemberView): Promise<void> {
    const slug = this.project()?.slug;
    if (!slug || !confirm(`Remove ${member.name} from this project?`)) return;
    try {
      await this.api.remove(slug, member.userId);
      this.members.reload();
    } catch (err) {
      this.snackBar.open(apiErrorMessage(err), 'Dismiss', { duration: 6000 });
    }
  }

  protected async invite(): Promise<void> {
    const slug = this.project()?.slug;
    if (!slug || this.inviteForm.invalid) {
      this.inviteForm.markAllAsTouched();
      return;
    }
    this.busy.set(true);
    this.inviteError.set(null);
    try {
      const { email, role } = this.inviteForm.getRawValue();
      await this.api.invite(slug, email, role);
      this.inviteForm.reset({ email: '', role: 'volunteer' });
      this.invitations.reload();
      this.snackBar.open(`Invitation sent to ${email}.`, undefined, { duration: 4000 });
    } catch (err) {
      this.inviteError.set(apiErrorMessage(err));
    } finally {
      this.busy.set(false);
    }
  }
}
