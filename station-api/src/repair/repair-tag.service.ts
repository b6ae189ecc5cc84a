import { EntityManager } from '@mikro-orm/sqlite';
import { ConflictException, Injectable, NotFoundException, UnprocessableEntityException } from '@nestjs/common';
import { Measurement, MeasurementVerdict } from '../runs/measurement.entity';
import { toMeasuredAgainstLimits } from '../runs/run-views';
import { RunVerdict, TestRun } from '../runs/test-run.entity';
import { isCode128TagText } from './code128';
import { renderRepairTag, RepairTagFailure, type PrinterDpi } from './repair-tag.pdf';

export interface RepairTagFile {
  pdf: Buffer;
  fileName: string;
}

/** Why a run gets no repair tag: HTTP 409 with `details.code` and a sentence for the operator. */
const REFUSALS: Record<Exclude<RunVerdict, RunVerdict.Fail>, { code: string; message: string }> = {
  [RunVerdict.Pass]: { code: 'run_passed', message: 'This unit passed; no repair tag is needed.' },
  [RunVerdict.Running]: { code: 'run_in_progress', message: 'The run is still going; print the repair tag once it has finished with a fail.' },
  [RunVerdict.Error]: {
    code: 'run_not_judged',
    message: 'This run ended in a fixture or software error, so the unit was not judged. Test it again instead of sending it to repair.',
  },
  [RunVerdict.Aborted]: {
    code: 'run_not_judged',
    message: 'This run was aborted, so the unit was not judged. Test it again instead of sending it to repair.',
  },
};

/** Builds the printable repair tag of a failed run. Reads only; nothing stored is changed. */
@Injectable()
export class RepairTagService {
  constructor(private readonly em: EntityManager) {}

  async forRun(runId: number, dpi: PrinterDpi = 203): Promise<RepairTagFile> {
    const em = this.em.fork();
    const run = await em.findOne(TestRun, { id: runId }, { populate: ['unit', 'lot', 'product', 'station', 'fixture', 'operator', 'planVersion.plan'] });
    if (!run) throw new NotFoundException({ message: `There is no run with id ${runId}.`, details: { code: 'run_not_found' } });
    if (run.verdict !== RunVerdict.Fail) {
      const r = REFUSALS[run.verdict];
      throw new ConflictException({ message: r.message, details: { code: r.code, verdict: run.verdict } });
    }
    const serial = run.unit.serial;
    if (!isCode128TagText(serial)) {
      throw new UnprocessableEntityException({
        message: `Serial ${JSON.stringify(serial)} cannot be printed as a barcode (only printable ASCII, up to 40 characters). Write the tag by hand.`,
        details: { code: 'serial_not_printable' },
      });
    }
    const failing = await em.find(
      Measurement,
      { run: runId, verdict: { $in: [MeasurementVerdict.Fail, MeasurementVerdict.GuardFail] } },
      { orderBy: { stepIndex: 'asc', id: 'asc' } },
    );
    const failures: RepairTagFailure[] = failing.map((m) => ({
      stepName: m.stepName,
      quantity: m.quantity,
      name: m.name,
      ...toMeasuredAgainstLimits(m),
      verdict: m.verdict === MeasurementVerdict.GuardFail ? 'guard_fail' : 'fail',
    }));
    const pdf = await renderRepairTag({
      runId: run.id,
      serial,
      partNumber: run.product.partNumber,
      lotCode: run.lot.code,
      stationCode: run.station.code,
      fixtureCode: run.fixture.code,
      operatorName: run.operator.displayName,
      attempt: run.attempt,
      // a failed run always has a finish time; the start is the fallback for a damaged record
      finishedAt: run.finishedAt ?? run.startedAt,
      plan: { code: run.planVersion.plan.code, version: run.planVersion.version },
      failures,
    }, { dpi });
    return { pdf, fileName: `repair-tag-${serial.replace(/[^A-Za-z0-9._-]/g, '_')}-run${run.id}.pdf` };
  }
}
