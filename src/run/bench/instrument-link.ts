// One instrument as the runner holds it: its profile, its SCPI session and its driver, and the two things
// a long run needs of a connection, starting it (identity checked against the profile, setup sent) and
// starting it again after the line dropped. What carries the bytes is the transport's business.
import {
  analyzerDriver,
  sessionFor,
  switchDriver,
  type AnalyzerDriver,
  type AnalyzerProfile,
  type DriverOptions,
  type Identity,
  type ScpiSession,
  type SessionNotice,
  type SwitchDriver,
  type SwitchProfile,
  type Transport,
} from '../../instruments/index.js';

export type InstrumentRole = 'analyzer' | 'switch';

export interface InstrumentLink<D> {
  readonly role: InstrumentRole;
  readonly session: ScpiSession;
  readonly driver: D;
  /** The *IDN? answer from the last start. */
  identity?: Identity;
  /** Opens the line, checks the identity against the profile, sends the setup. */
  start(): Promise<Identity>;
  /** Closes and opens the line again, then starts the instrument afresh. */
  restart(): Promise<Identity>;
  close(): Promise<void>;
  onNotice(listener: (notice: SessionNotice) => void): () => void;
}

export interface LinkOptions {
  traceFile?: string;
  driver?: DriverOptions;
}

export type AnalyzerLink = InstrumentLink<AnalyzerDriver> & { readonly profile: AnalyzerProfile };
export type SwitchLink = InstrumentLink<SwitchDriver> & { readonly profile: SwitchProfile };

export function analyzerLink(profile: AnalyzerProfile, transport: Transport, options: LinkOptions = {}): AnalyzerLink {
  const session = sessionFor(profile, transport, { traceFile: options.traceFile });
  return link('analyzer', profile, session, analyzerDriver(profile, session, options.driver));
}

export function switchLink(profile: SwitchProfile, transport: Transport, options: LinkOptions = {}): SwitchLink {
  const session = sessionFor(profile, transport, { traceFile: options.traceFile });
  return link('switch', profile, session, switchDriver(profile, session, options.driver));
}

function link<D extends { start(): Promise<Identity> }, P>(role: InstrumentRole, profile: P, session: ScpiSession, driver: D): InstrumentLink<D> & { readonly profile: P } {
  const self: InstrumentLink<D> & { readonly profile: P } = {
    role,
    profile,
    session,
    driver,
    async start() {
      await session.open();
      self.identity = await driver.start();
      return self.identity;
    },
    async restart() {
      await session.close().catch(() => undefined);
      return self.start();
    },
    close: () => session.close(),
    onNotice: (listener) => session.onNotice(listener),
  };
  return self;
}
