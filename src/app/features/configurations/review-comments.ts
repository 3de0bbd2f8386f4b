import { ChangeDetectionStrategy, Component, ElementRef, inject, input, model, signal, viewChild } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButton } from '@angular/material/button';
import { MatFormField, MatLabel } from '@angular/material/form-field';
import { MatInput } from '@angular/material/input';
import { MatOption, MatSelect } from '@angular/material/select';
import { firstValueFrom } from 'rxjs';
import { CommentThread, ConfigurationsApi } from './configurations-api';
import { problemText, refLabel, validRef } from './review-words';
import { formatLocalTime } from '../../core/time/local-time';
import { inputValue } from '../../core/forms/dom-events';
import { loadState } from '../../core/http/load-state';

export interface RefOption {
  readonly ref: string;
  readonly label: string;
}

/**
 * Review comment threads of a configuration: post (optionally pointing at a
 * result: the budget, a chart, a caution or a key figure), reply, resolve and
 * reopen. The page sets `target` when someone picks "Comment" beside a result.
 */
@Component({
  selector: 'rw-review-comments',
  imports: [MatButton, MatFormField, MatLabel, MatInput, MatSelect, MatOption],
  template: `
    @if (canComment()) {
      <form class="rw-comment-form" (submit)="$event.preventDefault(); post()" aria-label="New comment">
        <mat-form-field class="rw-wide-field">
          <mat-label>Points at</mat-label>
          <mat-select name="resultRef" [value]="target()" (selectionChange)="target.set($event.value)">
            <mat-option value="">The configuration as a whole</mat-option>
            @for (o of refOptions(); track o.ref) { <mat-option [value]="o.ref">{{ o.label }}</mat-option> }
          </mat-select>
        </mat-form-field>
        <mat-form-field class="rw-wide-field">
          <mat-label>Comment</mat-label>
          <textarea matInput #commentBox name="body" rows="3" maxlength="4000" [value]="draft()" (input)="draft.set(value($event))"></textarea>
        </mat-form-field>
        @if (postError(); as m) { <p class="rw-form-error" role="alert">{{ m }}</p> }
        <div class="rw-form-actions"><button mat-flat-button type="submit" [disabled]="busy()">Post comment</button></div>
      </form>
    }
    @let s = state();
    @switch (s.status) {
      @case ('loading') { <p class="rw-state" role="status">Loading comments…</p> }
      @case ('error') {
        <div class="rw-state rw-state-error" role="alert"><span>The comments could not be loaded: {{ s.message }}</span>
          <button mat-button type="button" (click)="load()">Try again</button></div>
      }
      @case ('ready') {
        @if (s.value.length === 0) {
          <p class="rw-state" role="status">No comments yet.</p>
        } @else {
          <ol class="rw-threads" aria-label="Review remarks">
            @for (t of s.value; track t.id) {
              <li class="rw-thread" [class.rw-thread-resolved]="t.resolved" [attr.data-ref]="t.resultRef">
                <article [attr.aria-label]="'Comment by ' + (t.authorName ?? 'someone')">
                  <p class="rw-thread-meta">
                    <strong>{{ t.authorName ?? 'Someone' }}</strong> · <time [attr.datetime]="t.createdAt">{{ time(t.createdAt) }}</time> · on revision {{ t.revision }}
                    @if (t.resultRef) { · <span class="rw-thread-ref">On: {{ label(t.resultRef) }}</span> }
                    · <span class="rw-thread-state">{{ t.resolved ? 'Closed' : 'Open' }}</span>
                  </p>
                  <p class="rw-thread-body">{{ t.body }}</p>
                  @for (r of t.replies; track r.id) {
                    <div class="rw-reply">
                      <p class="rw-thread-meta"><strong>{{ r.authorName ?? 'Someone' }}</strong> · <time [attr.datetime]="r.createdAt">{{ time(r.createdAt) }}</time></p>
                      <p class="rw-thread-body">{{ r.body }}</p>
                    </div>
                  }
                  @if (canComment()) {
                    <form class="rw-reply-form" (submit)="$event.preventDefault(); reply(t)" [attr.aria-label]="'Reply to ' + (t.authorName ?? 'this comment')">
                      <mat-form-field class="rw-wide-field">
                        <mat-label>Reply</mat-label>
                        <textarea matInput name="reply" rows="2" maxlength="4000" [value]="replies()[t.id] ?? ''" (input)="setReply(t.id, value($event))"></textarea>
                      </mat-form-field>
                      <div class="rw-form-actions">
                        <button mat-stroked-button type="submit" [disabled]="busy()">Reply</button>
                        <button mat-button type="button" [disabled]="busy()" (click)="setResolved(t, !t.resolved)">{{ t.resolved ? 'Reopen remark' : 'Close remark' }}</button>
                      </div>
                    </form>
                  }
                </article>
              </li>
            }
          </ol>
        }
      }
    }
    @if (threadError(); as m) { <p class="rw-form-error" role="alert">{{ m }}</p> }
  `,
  styles: `
    .rw-comment-form, .rw-reply-form { display: flex; flex-direction: column; gap: 0.4rem; max-width: 44rem; }
    .rw-wide-field { width: 100%; }
    .rw-threads { list-style: none; padding: 0; display: flex; flex-direction: column; gap: 0.75rem; }
    .rw-thread { border-left: 4px solid var(--mat-sys-primary); padding: 0.5rem 0.75rem; background: var(--mat-sys-surface-container-low); }
    .rw-thread-resolved { border-left-style: dashed; border-left-color: var(--mat-sys-outline); }
    .rw-thread-meta { margin: 0; font: var(--mat-sys-body-small); }
    .rw-thread-body { margin: 0.25rem 0 0.5rem; white-space: pre-wrap; }
    .rw-thread-state { font-weight: 600; }
    .rw-reply { margin-left: 1.25rem; padding-left: 0.75rem; border-left: 2px solid var(--mat-sys-outline-variant); }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ReviewComments {
  private readonly api = inject(ConfigurationsApi);
  readonly teamId = input.required<string>();
  readonly configurationId = input.required<string>();
  readonly canComment = input(false);
  readonly refOptions = input<readonly RefOption[]>([]);
  /** What the next comment points at ('' = nothing in particular). */
  readonly target = model('');

  private readonly threads = rxResource({
    params: () => ({ teamId: this.teamId(), configurationId: this.configurationId() }),
    stream: ({ params: p }) => this.api.comments(p.teamId, p.configurationId),
  });
  protected readonly state = loadState<readonly CommentThread[]>(this.threads);
  protected readonly draft = signal('');
  protected readonly replies = signal<Partial<Record<string, string>>>({});
  protected readonly busy = signal(false);
  protected readonly postError = signal<string | null>(null);
  protected readonly threadError = signal<string | null>(null);
  private readonly commentBox = viewChild<ElementRef<HTMLTextAreaElement>>('commentBox');

  /** Moves the keyboard focus to the comment box (after "Comment" beside a result). */
  focus(): void {
    this.commentBox()?.nativeElement.focus();
  }

  load(): void {
    this.threads.reload();
  }

  protected async post(): Promise<void> {
    const body = this.draft().trim();
    const ref = this.target();
    if (!body) {
      this.postError.set('Write the comment first.');
      return;
    }
    if (ref && !validRef(ref)) {
      this.postError.set('That result cannot be pointed at.');
      return;
    }
    await this.run(this.postError, async () => {
      await firstValueFrom(this.api.addComment(this.teamId(), this.configurationId(), { body, ...(ref ? { resultRef: ref } : {}) }));
      this.draft.set('');
      this.target.set('');
    });
  }

  protected async reply(t: CommentThread): Promise<void> {
    const body = (this.replies()[t.id] ?? '').trim();
    if (!body) {
      this.threadError.set('Write the reply first.');
      return;
    }
    await this.run(this.threadError, async () => {
      await firstValueFrom(this.api.addComment(this.teamId(), this.configurationId(), { body, parentId: t.id }));
      this.setReply(t.id, '');
    });
  }

  protected async setResolved(t: CommentThread, resolved: boolean): Promise<void> {
    await this.run(this.threadError, () => firstValueFrom(this.api.setResolved(this.teamId(), this.configurationId(), t.id, resolved)));
  }

  private async run(error: ReturnType<typeof signal<string | null>>, step: () => Promise<unknown>): Promise<void> {
    if (this.busy()) return;
    this.busy.set(true);
    error.set(null);
    try {
      await step();
      this.load();
    } catch (e) {
      error.set(problemText(e));
    } finally {
      this.busy.set(false);
    }
  }

  protected setReply(id: string, text: string): void {
    this.replies.update((r) => ({ ...r, [id]: text }));
  }

  protected label(ref: string): string {
    return this.refOptions().find((o) => o.ref === ref)?.label ?? refLabel(ref);
  }

  protected time(iso: string): string {
    return formatLocalTime(iso);
  }

  protected readonly value = inputValue;
}
