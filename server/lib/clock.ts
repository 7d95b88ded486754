export interface Clock {
  now(): Date;
}
export const systemClock: Clock = { now: () => new Date() };
export const isoNow = (clock: Clock): string => clock.now().toISOString();
export const today = (clock: Clock): string => clock.now().toISOString().slice(0, 10);
