import { formatLimit, formatValue, measureLabel } from "../format";
import { conditionOf, type Condition } from "../tracker";

/** EC near zero: the probe is in air (out of solution) or the tank is empty. */
export function outOfSolutionCondition(ec: number, maxEc: number): Condition {
  const dry = ec < maxEc;
  return conditionOf(dry);
}

export function outOfSolutionFireMessage(ec: number): string {
  return `${measureLabel("ec")} ${formatValue("ec", ec)} — probe may be out of solution or the tank empty`;
}

export function outOfSolutionClearMessage(ec: number, maxEc: number): string {
  return `${measureLabel("ec")} back above ${formatLimit("ec", maxEc)} (${formatValue("ec", ec)})`;
}
