import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import type { AdminUserView, OutboxMessage } from '../../../shared/admin';
import type { CreateProjectBody, MemberView, ProjectDetail } from '../../../shared/projects';
import type { ProjectRole } from '../../../shared/roles';

/** Admin writes: accounts, projects and memberships. */
@Injectable({ providedIn: 'root' })
export class AdminApi {
  private readonly http = inject(HttpClient);

  /** Creates an account; without a password the person gets a set-password e-mail. */
  createUser(body: {
    email: string;
    name: string;
    isAdmin: boolean;
    password?: string;
  }): Promise<AdminUserView> {
    return firstValueFrom(this.http.post<AdminUserView>('/api/admin/users', body));
  }

  /** Changes name, admin flag or disabled state. */
  updateUser(
    id: string,
    patch: { name?: string; isAdmin?: boolean; disabled?: boolean },
  ): Promise<AdminUserView> {
    return firstValueFrom(this.http.patch<AdminUserView>(`/api/admin/users/${id}`, patch));
  }

  /** Creates a project. */
  createProject(body: Partial<CreateProjectBody>): Promise<ProjectDetail> {
    return firstValueFrom(this.http.post<ProjectDetail>('/api/admin/projects', body));
  }

  /** Grants a role in a project. */
  grant(slug: string, userId: string, role: ProjectRole): Promise<MemberView[]> {
    return firstValueFrom(
      this.http.put<MemberView[]>(`/api/projects/${slug}/members/${userId}`, { role }),
    );
  }

  /** One page of the local outbox, newest first. */
  outbox(after: string | null): Promise<{ items: OutboxMessage[]; next: string | null }> {
    const params: Record<string, string> = { limit: '50' };
    if (after) params['after'] = after;
    return firstValueFrom(
      this.http.get<{ items: OutboxMessage[]; next: string | null }>('/api/admin/outbox', {
        params,
      }),
    );
  }
}
