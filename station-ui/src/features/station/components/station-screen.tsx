import { Modal, Stack, Text, Title } from '@mantine/core';
import { useQuery, useQueryClient } from '@tanstack/react-query';
import type { RunView, UnitView } from '@station-events';
import { useCallback, useEffect, useRef, useState } from 'react';
import { hasAnyRole, useUser } from '@/lib/auth';
import { useAbortRun } from '../api/abort-run';
import { liveRunQueryKey, liveRunQueryOptions } from '../api/get-live-run';
import { planAttemptsQueryKey, usePlanMaxAttempts } from '../api/get-plan-attempts';
import { useStationStatus } from '../api/get-station-status';
import { useStations } from '../api/get-stations';
import { useScanUnit, type ScanResult } from '../api/scan-unit';
import { useSendToRepair } from '../api/send-to-repair';
import { useStartRun } from '../api/start-run';
import { usePrintRepairTag } from '../hooks/use-print-repair-tag';
import { useRememberedStation } from '../hooks/use-remembered-station';
import { useSafetyKeys } from '../hooks/use-safety-keys';
import { useStationLive } from '../hooks/use-station-live';
import { useVerdictSound } from '../hooks/use-verdict-sound';
import { runFromStartAnswer, type LiveRun } from '../live-run';
import { describeRefusal, type RefusalMessage } from '../refusal-messages';
import type { GuardHint } from '../safety-keys';
import { LiveLinkBanner } from './live-link-banner';
import { OverrideDialog } from './override-dialog';
import { PRINT_KEY, ResultPanel, type RepairSendState } from './result-panel';
import { SafetyDialog } from './safety-dialog';
import { ScanField } from './scan-field';
import { ScanNotice } from './scan-notice';
import { ShiftCounters } from './shift-counters';
import { StationHeader } from './station-header';
import { StationPicker } from './station-picker';
import { StepList } from './step-list';
import classes from './station-screen.module.css';

/** Time to press Esc a second time before a stop request is forgotten (common practice, no source). */
export const ABORT_CONFIRM_MS = 3_000;

/** A scanned unit waiting for the operator's safety confirmation. */
interface PendingStart {
  serial: string;
  scan?: ScanResult;
  overrideReason?: string;
}

type Dialog = 'none' | 'safety' | 'override';

/** The unit block for a run the screen started without a scan answer (the engineer's override path). */
function unitOf(run: RunView, scan?: ScanResult): UnitView {
  return (
    scan?.unit ?? {
      id: run.unitId,
      serial: run.serial,
      state: 'passed',
      testCount: Math.max(0, run.attempt - 1),
      lotCode: run.lotCode,
      partNumber: run.partNumber,
      lastTestedAt: null,
    }
  );
}

interface StationConsoleProps {
  stationId: number;
  onChangeStation: () => void;
  /** A dialog outside the console (the station chooser) is open: leave the focus alone */
  outsideDialogOpen: boolean;
}

/** One station's operator console: scan, confirm, watch, verdict, next. */
function StationConsole({ stationId, onChangeStation, outsideDialogOpen }: StationConsoleProps) {
  const queryClient = useQueryClient();
  const me = useUser();
  const isEngineer = hasAnyRole(me.data, ['engineer']);
  const status = useStationStatus(stationId);
  const live = useQuery(liveRunQueryOptions(stationId, queryClient));
  const sound = useVerdictSound();
  const link = useStationLive(stationId, { onRunFinished: (p) => sound.play(p.verdict) });
  const scan = useScanUnit();
  const start = useStartRun();
  const abort = useAbortRun();
  const printer = usePrintRepairTag();
  const repairSend = useSendToRepair();

  const [refusal, setRefusal] = useState<RefusalMessage | null>(null);
  const [pending, setPending] = useState<PendingStart | null>(null);
  const [dialog, setDialog] = useState<Dialog>('none');
  const [abortArmed, setAbortArmed] = useState(false);
  const [scanText, setScanText] = useState('');
  const [safetyHint, setSafetyHint] = useState<GuardHint | null>(null);
  const [repair, setRepair] = useState<RepairSendState>({ kind: 'idle' });
  const scanRef = useRef<HTMLInputElement>(null);

  const run: LiveRun | null = live.data ?? null;
  const running = !!run && !run.finished;
  const maxAttempts = usePlanMaxAttempts(run?.run.planVersionId).data;
  const anyDialog = dialog !== 'none' || outsideDialogOpen;

  /** Focus back to the scan field after every action (after the dialog's own focus handling). */
  const focusScan = useCallback(() => {
    window.setTimeout(() => scanRef.current?.focus(), 0);
  }, []);

  useEffect(() => {
    if (!anyDialog) focusScan();
  }, [anyDialog, focusScan, run?.finished, refusal]);

  useEffect(() => {
    const onWindowFocus = () => {
      if (!anyDialog) focusScan();
    };
    window.addEventListener('focus', onWindowFocus);
    return () => window.removeEventListener('focus', onWindowFocus);
  }, [anyDialog, focusScan]);

  // a stop request lapses after a moment, and with the end of the run
  useEffect(() => {
    if (!abortArmed) return;
    const t = window.setTimeout(() => setAbortArmed(false), ABORT_CONFIRM_MS);
    return () => window.clearTimeout(t);
  }, [abortArmed]);
  useEffect(() => {
    if (!running) setAbortArmed(false);
  }, [running]);

  const doAbort = useCallback(() => {
    if (!run || run.finished) return;
    setAbortArmed(false);
    abort.mutate(run.run.id, {
      onError: (err) => {
        // "already finished" needs no message: the verdict is on its way
        if (!(err && typeof err === 'object' && 'code' in err && err.code === 'run_finished')) {
          setRefusal({ code: 'other', title: 'Stop not confirmed', detail: err instanceof Error ? err.message : 'Try Esc again.' });
        }
      },
    });
    focusScan();
  }, [abort, focusScan, run]);

  const doPrint = useCallback(() => {
    if (run?.finished?.verdict !== 'fail') return;
    void printer.print(run.run.id).finally(focusScan);
  }, [focusScan, printer, run]);

  // Esc stops a test (pressed twice); F8 prints a failed unit's repair tag. Dialogs handle their own keys.
  useEffect(() => {
    const onKey = (e: KeyboardEvent) => {
      if (anyDialog) return;
      if (e.key === 'Escape' && running) {
        e.preventDefault();
        if (abortArmed) doAbort();
        else setAbortArmed(true);
      } else if (e.key === PRINT_KEY) {
        e.preventDefault();
        doPrint();
      }
    };
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, [abortArmed, anyDialog, doAbort, doPrint, running]);

  const onScan = (serial: string) => {
    sound.unlock();
    const partNumber = status.data?.activeLot?.partNumber;
    if (running) {
      // in its own place: the run on screen (and its coming verdict) stays where it is
      setRefusal({
        code: 'station_busy',
        title: 'Station busy',
        detail: `${run!.run.serial} is being tested. Wait for its result, then scan ${serial} again.`,
      });
      return;
    }
    if (link !== 'live') {
      setRefusal({
        code: 'no_link',
        title: 'Server not reachable',
        detail: `Nothing was started for ${serial}. Wait until the station shows READY again, then scan it again.`,
      });
      return;
    }
    setRefusal(null);
    printer.reset();
    setRepair({ kind: 'idle' });
    // the last verdict stays on screen until the next scan: this is the next scan
    queryClient.setQueryData<LiveRun | null>(liveRunQueryKey(stationId), null);
    scan.mutate(
      { stationId, serial },
      {
        onSuccess: (result) => {
          queryClient.setQueryData(planAttemptsQueryKey(result.plan.versionId), result.plan.maxAttempts);
          setSafetyHint(null);
          setPending({ serial: result.unit.serial, scan: result });
          setDialog('safety');
        },
        onError: (err) => {
          const message = describeRefusal(err, { serial, partNumber, isEngineer });
          setRefusal(message);
          if (message.canOverride) {
            setPending({ serial });
            setDialog('override');
          }
        },
      },
    );
  };

  const confirmSafety = () => {
    const p = pending;
    setDialog('none');
    setPending(null);
    if (!p) return;
    setRefusal(null);
    start.mutate(
      { stationId, serial: p.serial, overrideReason: p.overrideReason },
      {
        onSuccess: ({ run: started }) => {
          queryClient.setQueryData<LiveRun | null>(liveRunQueryKey(stationId), (old) =>
            // `run:started` usually arrives first and has laid the steps out already
            old && old.run.id === started.id ? old : runFromStartAnswer(started, unitOf(started, p.scan), p.scan?.plan.steps ?? []),
          );
        },
        onError: (err) => setRefusal(describeRefusal(err, { serial: p.serial, partNumber: status.data?.activeLot?.partNumber, isEngineer })),
      },
    );
    focusScan();
  };

  const cancelSafety = () => {
    setDialog('none');
    setPending(null);
    focusScan();
  };

  const scanTextRef = useRef(scanText);
  scanTextRef.current = scanText;
  const onScanRef = useRef(onScan);
  onScanRef.current = onScan;
  const safetyKeys = useSafetyKeys(dialog === 'safety', {
    onConfirm: confirmSafety,
    onCancel: cancelSafety,
    // a label scanned into the prompt: this unit gets no power; the new scan is collected and then sent
    onBurstStart: () => {
      cancelSafety();
      // a scanner already typing when the prompt opened left the start of its label in the field
      const head = scanTextRef.current;
      setScanText('');
      return head;
    },
    onBurstScan: (serial) => onScanRef.current(serial),
    onBurstText: (text) => {
      setScanText((t) => t + text);
      focusScan();
    },
    onHint: (hint) => {
      // an Enter that ends a label typed into the field before the prompt opened: that label is a new scan
      const typed = scanTextRef.current.trim();
      if (hint === 'not_enter' && typed) {
        cancelSafety();
        setScanText('');
        onScanRef.current(typed);
        return;
      }
      setSafetyHint(hint);
    },
  });

  const pointerConfirm = () => {
    if (safetyKeys.pointerMayConfirm()) confirmSafety();
    else setSafetyHint('too_soon');
  };

  const sendToRepair = () => {
    if (!run?.finished || run.finished.verdict !== 'fail') return;
    setRepair({ kind: 'sending' });
    repairSend.mutate(
      { serial: run.run.serial },
      {
        onSuccess: () => setRepair({ kind: 'sent' }),
        onError: (err) => setRepair({ kind: 'failed', message: `Not sent to repair: ${err instanceof Error ? err.message : 'try again'}.` }),
        onSettled: focusScan,
      },
    );
  };

  const submitOverride = (reason: string) => {
    setPending((p) => (p ? { ...p, overrideReason: reason } : p));
    setRefusal(null);
    setDialog('safety');
  };

  const cancelOverride = () => {
    setDialog('none');
    setPending(null);
    focusScan();
  };

  return (
    <div className={classes.screen}>
      <LiveLinkBanner link={link} />
      <StationHeader status={status.data} link={link} statusFailed={status.isError && !status.data} muted={sound.muted} onToggleMuted={() => { sound.toggleMuted(); focusScan(); }} onChangeStation={onChangeStation} />
      <div className={classes.scanRow} data-testid="scan-row">
        <ScanField ref={scanRef} value={scanText} onValueChange={setScanText} onScan={onScan} busy={scan.isPending} onKeyActivity={sound.unlock} onBlurToNowhere={() => !anyDialog && focusScan()} />
        <ShiftCounters stationId={stationId} />
      </div>
      {refusal && <ScanNotice refusal={refusal} besideRun={!!run} onDismiss={() => { setRefusal(null); focusScan(); }} />}
      <ResultPanel
        live={run}
        starting={start.isPending}
        status={status.data}
        statusFailed={status.isError && !status.data}
        link={link}
        maxAttempts={maxAttempts}
        abortArmed={abortArmed}
        aborting={abort.isPending}
        onAbort={doAbort}
        print={printer.state}
        onPrint={doPrint}
        repair={repair}
        onSendToRepair={sendToRepair}
      />
      <div className={classes.steps}>
        {run && run.steps.length > 0 ? (
          <StepList live={run} />
        ) : (
          <div className={classes.stepsEmpty}>The test steps appear here when a unit is scanned.</div>
        )}
      </div>
      <SafetyDialog
        opened={dialog === 'safety'}
        serial={pending?.serial ?? ''}
        partNumber={pending?.scan?.product.partNumber}
        attempt={pending?.scan?.attempt}
        maxAttempts={pending?.scan?.plan.maxAttempts}
        overrideReason={pending?.overrideReason}
        hint={safetyHint}
        onPointerConfirm={pointerConfirm}
        onCancel={cancelSafety}
      />
      <OverrideDialog opened={dialog === 'override'} serial={pending?.serial ?? ''} onSubmit={submitOverride} onCancel={cancelOverride} />
    </div>
  );
}

/**
 * The operator station (`/station`): choose the station once (remembered on this computer), then scan,
 * confirm the safety prompt, watch the steps and read the verdict, all from the keyboard.
 */
export function StationScreen() {
  const [stationId, setStationId] = useRememberedStation();
  const [choosing, setChoosing] = useState(false);
  const stations = useStations();

  // a remembered station that no longer exists is forgotten
  useEffect(() => {
    if (stationId !== null && stations.data && !stations.data.some((s) => s.id === stationId)) setStationId(null);
  }, [setStationId, stationId, stations.data]);

  const pick = (id: number) => {
    setStationId(id);
    setChoosing(false);
  };

  if (stationId === null) {
    return (
      <Stack maw={720} gap="lg" className={classes.firstPick}>
        <Title order={1} fz={40}>
          Which station is this?
        </Title>
        <Text fz={20}>Choose the station this screen stands at. This computer remembers it.</Text>
        <StationPicker selectedId={null} onPick={pick} autoFocusFirst />
      </Stack>
    );
  }

  return (
    <>
      <StationConsole key={stationId} stationId={stationId} onChangeStation={() => setChoosing(true)} outsideDialogOpen={choosing} />
      <Modal opened={choosing} onClose={() => setChoosing(false)} title="Change station" size="lg" styles={{ title: { fontSize: 26, fontWeight: 700 } }}>
        <StationPicker selectedId={stationId} onPick={pick} />
      </Modal>
    </>
  );
}
