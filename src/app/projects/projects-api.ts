import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import type { ProjectDetail, UpdateProjectBody } from '../../../shared/projects';

/** Writes to a project's settings. */
@Injectable({ providedIn: 'root' })
export class ProjectsApi {
  private readonly http = inject(HttpClient);

  /** Saves changed settings and returns the project as stored. */
  updateSettings(slug: string, patch: UpdateProjectBody): Promise<ProjectDetail> {
    return firstValueFrom(this.http.patch<ProjectDetail>(`/api/projects/${slug}`, patch));
  }
}
