import { BreakpointObserver } from '@angular/cdk/layout';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { MatIconButton, MatButton } from '@angular/material/button';
import { MatDivider } from '@angular/material/divider';
import { MatIcon } from '@angular/material/icon';
import { MatListItem, MatListItemIcon, MatListItemTitle, MatNavList } from '@angular/material/list';
import { MatMenu, MatMenuItem, MatMenuTrigger } from '@angular/material/menu';
import { MatSidenav, MatSidenavContainer, MatSidenavContent } from '@angular/material/sidenav';
import { MatToolbar } from '@angular/material/toolbar';
import { MatTooltip } from '@angular/material/tooltip';
import { Router, RouterLink, RouterLinkActive, RouterOutlet } from '@angular/router';
import { map } from 'rxjs';
import { ROLE_LABELS } from '../../../shared/roles';
import { AuthStore } from '../core/auth-store';
import { navFor } from '../core/navigation';
import { ProjectStore } from '../core/project-store';
import { ThemeToggle } from './theme-toggle';

/** Toolbar with project switcher and account menu; side navigation by role inside a project. */
@Component({
  selector: 'mac-app-shell',
  imports: [
    MatToolbar,
    MatIconButton,
    MatButton,
    MatIcon,
    MatMenu,
    MatMenuItem,
    MatMenuTrigger,
    MatDivider,
    MatSidenav,
    MatSidenavContainer,
    MatSidenavContent,
    MatNavList,
    MatListItem,
    MatListItemIcon,
    MatListItemTitle,
    MatTooltip,
    RouterLink,
    RouterLinkActive,
    RouterOutlet,
    ThemeToggle,
  ],
  templateUrl: './app-shell.html',
  styleUrl: './app-shell.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AppShell {
  private readonly auth = inject(AuthStore);
  private readonly router = inject(Router);
  protected readonly projects = inject(ProjectStore);
  protected readonly user = this.auth.user;
  protected readonly isAdmin = this.auth.isAdmin;
  protected readonly compact = toSignal(
    inject(BreakpointObserver)
      .observe('(max-width: 900px)')
      .pipe(map((state) => state.matches)),
    { initialValue: false },
  );
  protected readonly navOpen = signal(true);
  protected readonly project = this.projects.current;
  protected readonly nav = computed(() => navFor(this.project()?.role ?? null, this.isAdmin()));
  protected readonly roleLabel = computed(() => {
    const role = this.project()?.role;
    return role ? ROLE_LABELS[role] : this.isAdmin() ? 'Admin' : '';
  });

  constructor() {
    void this.projects.loadList();
  }

  protected toggleNav(): void {
    this.navOpen.update((open) => !open);
  }

  protected closeNavOnCompact(): void {
    if (this.compact()) this.navOpen.set(false);
  }

  protected switchProject(slug: string): void {
    void this.router.navigate(['/p', slug, 'overview']);
  }

  protected async signOut(): Promise<void> {
    await this.auth.signOut();
    this.projects.current.set(null);
    await this.router.navigate(['/sign-in']);
  }
}
