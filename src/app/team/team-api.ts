import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import type { InvitationView, MemberView } from '../../../shared/projects';
import type { ProjectRole } from '../../../shared/roles';

/** Team writes: roles, removals and invitations. */
@Injectable({ providedIn: 'root' })
export class TeamApi {
  private readonly http = inject(HttpClient);

  /** Grants or changes a role; returns the members after the change. */
  setRole(slug: string, userId: string, role: ProjectRole): Promise<MemberView[]> {
    return firstValueFrom(
      this.http.put<MemberView[]>(`/api/projects/${slug}/members/${userId}`, { role }),
    );
  }

  /** Removes someone from the project. */
  remove(slug: string, userId: string): Promise<unknown> {
    return firstValueFrom(this.http.delete(`/api/projects/${slug}/members/${userId}`));
  }

  /** Invites an address; the link goes out by e-mail. */
  invite(slug: string, email: string, role: ProjectRole): Promise<InvitationView> {
    return firstValueFrom(
      this.http.post<InvitationView>(`/api/projects/${slug}/invitations`, { email, role }),
    );
  }
}
