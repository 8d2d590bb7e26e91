// A request to stop, raised once (Ctrl-C, SIGTERM, the operator leaving) and heard by everything that
// waits. The runner never breaks off a command half way: it finishes the reading in hand, logs it, and
// then stops, so nothing measured is lost and the instruments are never left mid-conversation.
import { ReplaySubject, type Observable } from 'rxjs';

export class StopSignal {
  private readonly raised = new ReplaySubject<string>(1);
  private why?: string;
  private failedWith?: unknown;

  /** Emits the reason once, when a stop is first requested (at once for a late subscriber). */
  readonly requested$: Observable<string> = this.raised.asObservable();

  get requested(): boolean {
    return this.why !== undefined;
  }

  get reason(): string | undefined {
    return this.why;
  }

  /** Set when the stop was asked for because something outside the runner failed (the log could not be written). */
  get failure(): unknown {
    return this.failedWith;
  }

  /**
   * Asks for a stop because of a failure outside the runner: the run ends as `failed` with this error as
   * its reason, after the reading in hand and with the bench brought to its safe state as for any stop.
   */
  fail(error: unknown): void {
    if (this.why !== undefined) return;
    this.failedWith = error;
    this.request(error instanceof Error ? error.message : String(error));
  }

  /** Asks for a stop; later requests change nothing (a second Ctrl-C does not skip the safe stop). */
  request(reason: string): void {
    if (this.why !== undefined) return;
    this.why = reason;
    this.raised.next(reason);
    this.raised.complete();
  }
}
