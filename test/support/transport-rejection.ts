// The TransportError a transport operation must fail with (any other outcome fails the test).
import { expect } from 'vitest';
import { TransportError } from '../../src/instruments/transport.js';

export async function transportRejection(promise: Promise<unknown>): Promise<TransportError> {
  try {
    await promise;
  } catch (error) {
    expect(error).toBeInstanceOf(TransportError);
    return error as TransportError;
  }
  throw new Error('expected a TransportError');
}
