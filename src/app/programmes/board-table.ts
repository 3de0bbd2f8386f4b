import { ChangeDetectionStrategy, Component, computed, inject, input } from '@angular/core';
import { DISPLAY_UNITS } from '../core/format/num-pipe';
import { RouterLink } from '@angular/router';
import { formatLocalTime } from '../core/time/local-time';
import {
  BOARD_FIGURES,
  boardFigureIn,
  formatChange,
  formatFigure,
  latestError,
  latestFigures,
  profileLabel,
  statusWords,
} from './board-figures';
import type { Board, BoardRow, KeyFigures } from './programmes-api';

interface ShownRow {
  readonly key: string;
  readonly row: BoardRow;
  readonly latest: KeyFigures | null;
  readonly error: string | null;
  /** The approval was computed on another track profile than the board's. */
  readonly otherProfile: boolean;
}

/**
 * The programme board (live or a snapshot): one group of lines per
 * configuration — latest revision, latest approval, and the change between
 * them written as signed numbers — so differences read without colour.
 * Each configuration's name opens its page in the team (read only for an
 * instructor: the page offers only what the caller's permissions allow, and
 * an instructor holds none in the team).
 */
@Component({
  selector: 'rw-board-table',
  imports: [RouterLink],
  templateUrl: './board-table.html',
  styleUrl: './board-table.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class BoardTable {
  readonly board = input.required<Board>();
  readonly timeZone = input.required<string>();
  /** Caption words, e.g. "Board now" or the snapshot's label. */
  readonly caption = input('Programme board');

  /** The user's unit system (account setting): bump steer in deg/m or deg/in. */
  private readonly units = inject(DISPLAY_UNITS);
  protected readonly figures = computed(() => BOARD_FIGURES.map((f) => ({ ...f, ...boardFigureIn(f, this.units()) })));
  protected readonly profile = computed(() => profileLabel(this.board().trackProfile));
  protected readonly rows = computed<ShownRow[]>(() =>
    this.board().rows.map((row) => ({
      key: row.teamId + '/' + row.configurationId,
      row,
      latest: latestFigures(row),
      error: latestError(row),
      otherProfile: !!row.approved && row.approved.trackProfile !== this.board().trackProfile,
    })),
  );

  protected readonly figure = formatFigure;
  protected readonly change = formatChange;
  protected readonly statusWords = statusWords;
  protected readonly profileLabel = profileLabel;

  protected local(iso: string): string {
    return formatLocalTime(iso, this.timeZone());
  }
}
