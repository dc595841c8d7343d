import { NUMERIC_COLUMNS, type Sample } from '@thermargin/shared';
import { VehicleStream } from '@thermargin/cli/import/vehicle-stream';

/** The offline CLI's streaming analysis (services/cli), fed sample objects instead of CSV rows. */
export class CliVehicleStream extends VehicleStream {
  private readonly row = new Float64Array(NUMERIC_COLUMNS.length);

  pushSample(s: Sample): void {
    NUMERIC_COLUMNS.forEach((name, k) => {
      this.row[k] = s[name] ?? Number.NaN;
    });
    this.push(this.row, s.trip);
  }
}
