/** placeholder */
export class ScenarioInputError extends Error {
  constructor(readonly label: string, readonly issues: readonly { field: string; message: string }[]) { super(label); }
}
export function simulateScenario(_spec: unknown, _scenario: unknown, _vectors: number | undefined): { metrics: unknown; vectorsCsv: string } {
  throw new Error('pending');
}
