import { parameterLabels, unitLabel } from './setup-labels';

/** A channel as people pick it: "NOx (as NO2) · mg/Nm3, dry". */
export function channelLabel(channel: { parameter: string; unit: string; basis: string }): string {
  const parameter = (parameterLabels as Record<string, string>)[channel.parameter] ?? channel.parameter;
  return `${parameter} · ${unitLabel(channel.unit)}, ${channel.basis}`;
}
