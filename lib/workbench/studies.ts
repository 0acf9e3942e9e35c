/**
 * Runs the studies on the worker pool: splits each study into index ranges, streams every finished chunk and its
 * progress into the store, and cancels on request (the pool terminates busy workers). One AbortController per
 * study kind: starting a study again replaces the previous run of that kind.
 */
import type { Remote } from "comlink";
import { axisValues, compensateCandidates, type CompensateScanRow } from "@/lib/design/studies";
import type { Scenario } from "@/lib/design/schema";
import type { SimWorkerApi } from "@/workers/sim.worker";
import { isAbortError } from "./bridge";
import { errorMessage } from "./live";
import { chunkRanges, type WorkerPool } from "./pool";
import type { StudyChunks, StudyKind, WbStore } from "./types";

/** Points per chunk: small chunks stream results sooner and give a steadier time-left estimate. */
export const CHUNK_POINTS: Record<StudyKind, number> = { sweep: 1, map: 4, spread: 10, compensate: 6 };

type Job<R> = (api: Remote<SimWorkerApi>, range: [number, number]) => Promise<R>;

export class StudyRunner {
  private readonly controllers = new Map<StudyKind, AbortController>();
  private readonly inputs = new Map<StudyKind, Scenario>();

  constructor(
    private readonly store: WbStore,
    private readonly pool: WorkerPool<SimWorkerApi>,
  ) {}

  running(kind: StudyKind): boolean {
    return this.controllers.has(kind);
  }

  cancel(kind: StudyKind): void {
    const ctl = this.controllers.get(kind);
    if (!ctl) return;
    this.controllers.delete(kind);
    ctl.abort();
    this.store.getState().cancelStudy(kind);
  }

  cancelAll(): void {
    for (const k of [...this.controllers.keys()]) this.cancel(k);
  }

  /** The scenario the latest run of `kind` started from (to tell when the design has moved on since). */
  startedWith(kind: StudyKind): Scenario | null {
    return this.inputs.get(kind) ?? null;
  }

  private begin(kind: StudyKind): AbortController {
    this.controllers.get(kind)?.abort();
    this.inputs.set(kind, this.store.getState().scenario);
    const ctl = new AbortController();
    this.controllers.set(kind, ctl);
    return ctl;
  }

  private end(kind: StudyKind, ctl: AbortController): void {
    if (this.controllers.get(kind) === ctl) this.controllers.delete(kind);
  }

  /** Run `total` points in chunks; each chunk's result goes to the store as it arrives. */
  private async chunked<K extends "sweep" | "map" | "spread">(kind: K, total: number, job: Job<StudyChunks[K]>): Promise<void> {
    const ctl = this.begin(kind);
    const id = this.store.getState().beginStudy(kind, total);
    try {
      await this.pool.map(ctl.signal, chunkRanges(total, CHUNK_POINTS[kind]), job, (r, range) => {
        this.store.getState().studyChunk(kind, id, r, range[1] - range[0]);
      });
      this.store.getState().finishStudy(kind, id);
    } catch (e) {
      if (!isAbortError(e)) this.store.getState().failStudy(kind, id, errorMessage(e));
    } finally {
      this.end(kind, ctl);
    }
  }

  sweep(): Promise<void> {
    const s: Scenario = this.store.getState().scenario;
    const axis = s.studies.sweep;
    let total: number;
    try {
      total = axisValues(axis).length;
    } catch (e) {
      return this.refuse("sweep", e);
    }
    return this.chunked("sweep", total, (api, [a, b]) => api.sweep(s, axis, a, b));
  }

  map(): Promise<void> {
    const s: Scenario = this.store.getState().scenario;
    const settings = s.studies.map;
    let total: number;
    try {
      total = axisValues(settings.x).length * axisValues(settings.y).length;
    } catch (e) {
      return this.refuse("map", e);
    }
    return this.chunked("map", total, (api, [a, b]) => api.map(s, settings, a, b));
  }

  spread(): Promise<void> {
    const s: Scenario = this.store.getState().scenario;
    const settings = s.studies.spread;
    return this.chunked("spread", settings.runs, (api, [a, b]) => api.spread(s, settings, a, b));
  }

  /** Scan every candidate across the pool, then pick on one worker; the pick counts as the last few points. */
  async compensate(): Promise<void> {
    const s: Scenario = this.store.getState().scenario;
    const settings = s.studies.compensate;
    const total = compensateCandidates(s, settings).length;
    const pickPoints = Math.max(1, Math.ceil(total / 10));
    const ctl = this.begin("compensate");
    const st = () => this.store.getState();
    const id = st().beginStudy("compensate", total + pickPoints);
    try {
      const rows: CompensateScanRow[] = [];
      await this.pool.map(ctl.signal, chunkRanges(total, CHUNK_POINTS.compensate), (api, [a, b]) => api.compensateScan(s, settings, a, b), (r, range) => {
        rows.push(...r);
        st().studyChunk("compensate", id, { scan: r, result: null }, range[1] - range[0]);
      });
      rows.sort((x, y) => x.index - y.index);
      let result: Awaited<ReturnType<SimWorkerApi["compensatePick"]>> | null = null;
      await this.pool.map(ctl.signal, [0], (api) => api.compensatePick(s, settings, rows), (r) => {
        result = r;
      });
      if (result) st().studyChunk("compensate", id, { scan: null, result }, pickPoints);
      st().finishStudy("compensate", id);
    } catch (e) {
      if (!isAbortError(e)) st().failStudy("compensate", id, errorMessage(e));
    } finally {
      this.end("compensate", ctl);
    }
  }

  private refuse(kind: StudyKind, e: unknown): Promise<void> {
    const id = this.store.getState().beginStudy(kind, 0);
    this.store.getState().failStudy(kind, id, errorMessage(e));
    return Promise.resolve();
  }
}
