// The step budget every engine checks before an attempt: the step limit and the deadline.

/** Checking the clock is not free: look every this many attempted steps. */
export const DEADLINE_EVERY = 16;

export interface BudgetStop {
  readonly status: 'step-limit' | 'timeout';
  readonly message: string;
}

/**
 * Why a solve must stop before attempt number `attempts` (accepted + rejected so far, or steps
 * taken), or null to go on. The clock is read only every DEADLINE_EVERY attempts.
 */
export function budgetStop(attempts: number, maxSteps: number, deadline: number | undefined, t: number): BudgetStop | null {
  if (attempts >= maxSteps) return { status: 'step-limit', message: `reached maxSteps=${maxSteps} at t=${t}` };
  if (deadline !== undefined && attempts % DEADLINE_EVERY === 0 && performance.now() > deadline) {
    return { status: 'timeout', message: `deadline passed at t=${t}` };
  }
  return null;
}
