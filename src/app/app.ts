import { ChangeDetectionStrategy, Component, DestroyRef, ElementRef, inject, viewChild } from '@angular/core';
import { takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import {
  NavigationCancel,
  NavigationEnd,
  NavigationError,
  NavigationStart,
  Router,
  RouterOutlet,
} from '@angular/router';
import { AuthService } from './core/auth/auth-service';
import { EngineVersionCheck } from './core/layout/engine-version-check';
import { LoadingIndicator } from './core/layout/loading-indicator';
import { TopBar } from './core/layout/top-bar';

@Component({
  selector: 'rw-root',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [RouterOutlet, TopBar, MatButtonModule],
  templateUrl: './app.html',
  styleUrl: './app.scss',
})
export class App {
  protected readonly loading = inject(LoadingIndicator);
  protected readonly auth = inject(AuthService);
  protected readonly engine = inject(EngineVersionCheck);
  private readonly main = viewChild.required<ElementRef<HTMLElement>>('main');

  constructor() {
    this.engine.check();
    // Route loads (lazy chunks, guards fetching data) count as loading too.
    let navigating = false;
    inject(Router)
      .events.pipe(takeUntilDestroyed(inject(DestroyRef)))
      .subscribe((event) => {
        if (event instanceof NavigationStart && !navigating) {
          navigating = true;
          this.loading.begin();
        }
        if (event instanceof NavigationEnd) this.keepFocusOnPage();
        if (
          (event instanceof NavigationEnd ||
            event instanceof NavigationCancel ||
            event instanceof NavigationError) &&
          navigating
        ) {
          navigating = false;
          this.loading.end();
        }
      });
  }

  protected reload(): void {
    location.reload();
  }

  /**
   * After a route change the focused control (say, the sign-in button) may
   * have left the page; start keyboard and screen-reader users at the
   * content instead of nowhere. Focus that is still on the page is left alone.
   */
  private keepFocusOnPage(): void {
    setTimeout(() => {
      const active = document.activeElement;
      if (!active || active === document.body) this.main().nativeElement.focus();
    });
  }

  protected skipToContent(): void {
    this.main().nativeElement.focus();
  }
}
