/**
 * A local stand-in for an outside service (mail, later weather, storage, payments).
 * `start` resolves once the fake accepts connections and returns the lines to print
 * (addresses a developer or a test needs); `stop` releases every port it holds.
 */
export interface Fake {
  readonly name: string;
  start(): Promise<string[]>;
  stop(): Promise<void>;
}
