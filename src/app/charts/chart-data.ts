import { ChangeDetectionStrategy, Component, input, signal } from '@angular/core';
import { downloadText, fileNameFor, toCsv } from './csv';

let nextDataId = 0;

/**
 * A chart's numbers: the "Show as table" toggle with the table itself and
 * the "Download CSV" command, shared by every chart.
 */
@Component({
  selector: 'rw-chart-data',
  templateUrl: './chart-data.html',
  styleUrl: './chart-data.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ChartData {
  readonly chartTitle = input.required<string>();
  readonly header = input.required<readonly string[]>();
  readonly cells = input.required<readonly (readonly string[])[]>();
  /** First column names the row (a term, a series) rather than holding a number. */
  readonly rowHeaders = input<boolean>(false);

  protected readonly id = `rw-chart-data-${nextDataId++}`;
  protected readonly showTable = signal(false);

  protected toggleTable(): void {
    this.showTable.update((v) => !v);
  }

  protected downloadCsv(): void {
    downloadText(toCsv(this.header(), this.cells(), [this.chartTitle()]), fileNameFor(this.chartTitle(), 'csv'));
  }
}
