// The IEEE 488.2 status registers (11.5 and 11.2 (from memory)): the standard event status register (ESR)
// with its enable mask (ESE), and the status byte (STB) with its service request enable (SRE).

import { errorClass } from './error-codes.js';

/** ESR bits, IEEE 488.2 11.5.1 (from memory). */
export const ESR = {
  operationComplete: 1 << 0,
  requestControl: 1 << 1,
  queryError: 1 << 2,
  deviceError: 1 << 3,
  executionError: 1 << 4,
  commandError: 1 << 5,
  userRequest: 1 << 6,
  powerOn: 1 << 7,
} as const;

/** STB bits: 2 error/event queue not empty (SCPI-99), 4 MAV, 5 ESB, 6 MSS (IEEE 488.2 11.2 (from memory)). */
export const STB = {
  errorQueue: 1 << 2,
  messageAvailable: 1 << 4,
  eventSummary: 1 << 5,
  masterSummary: 1 << 6,
} as const;

export class StatusRegisters {
  esr = ESR.powerOn;
  ese = 0;
  sre = 0;

  /** Sets the ESR bit an error's class calls for. */
  noteError(code: number): void {
    const bit = { command: ESR.commandError, execution: ESR.executionError, device: ESR.deviceError, query: ESR.queryError, none: 0 }[errorClass(code)];
    this.esr |= bit;
  }

  /** *ESR? reads and clears. */
  readEsr(): number {
    const value = this.esr;
    this.esr = 0;
    return value;
  }

  /** The status byte as *STB? reads it (MSS in bit 6; *STB? does not clear anything). */
  statusByte(errorsQueued: boolean, messageAvailable: boolean): number {
    let stb = 0;
    if (errorsQueued) stb |= STB.errorQueue;
    if (messageAvailable) stb |= STB.messageAvailable;
    if ((this.esr & this.ese) !== 0) stb |= STB.eventSummary;
    if ((stb & this.sre & ~STB.masterSummary) !== 0) stb |= STB.masterSummary;
    return stb;
  }

  /** Power-on: PON set, the enable masks cleared (IEEE 488.2 power-on state (from memory)). */
  powerOn(): void {
    this.esr = ESR.powerOn;
    this.ese = 0;
    this.sre = 0;
  }
}
