// What every simulated instrument shares: its SCPI engine (ScpiDevice) takes the messages, answers the
// IEEE 488.2 common commands, keeps the error queue and the identity. An instrument adds its own command
// tree and state, and hands them to the engine it builds in its constructor.
import type { SimulatedDevice } from './device.js';
import type { ScpiDevice } from './scpi/scpi-device.js';

export abstract class ScpiInstrument implements SimulatedDevice {
  protected abstract readonly scpi: ScpiDevice;

  get identity(): string {
    return this.scpi.identity;
  }

  receive(message: string): Promise<string | undefined> {
    return this.scpi.receive(message);
  }

  reset(): void {
    this.scpi.reset();
  }

  reboot(): void {
    this.scpi.reboot();
  }

  injectError(code: number, detail?: string): void {
    this.scpi.injectError(code, detail);
  }

  unterminatedQuery(fragment: string): void {
    this.scpi.unterminatedQuery(fragment);
  }
}
