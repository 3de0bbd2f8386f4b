import { ChangeDetectionStrategy, Component } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { RouterLink } from '@angular/router';

@Component({
  selector: 'rw-not-found-page',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [RouterLink, MatButtonModule],
  template: `
    <section class="rw-page-narrow">
      <h1>Page not found</h1>
      <p class="rw-muted">There is nothing at this address. It may have moved, or the link was mistyped.</p>
      <a mat-flat-button routerLink="/">Go to your team</a>
    </section>
  `,
})
export class NotFoundPage {}
