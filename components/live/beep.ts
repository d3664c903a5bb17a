"use client";
// A short two-tone chime for a new incident, made with WebAudio (no sound file shipped).
let context: AudioContext | null = null;

/** Creates or resumes the audio context; browsers allow this only after a click or key press. */
export function unlockAudio() {
  context ??= new AudioContext();
  if (context.state === "suspended") void context.resume();
}

export function beep() {
  if (!context || context.state !== "running") return;
  const t0 = context.currentTime;
  for (const [i, freq] of [880, 660].entries()) {
    const osc = context.createOscillator();
    const gain = context.createGain();
    osc.type = "sine";
    osc.frequency.value = freq;
    const start = t0 + i * 0.18;
    gain.gain.setValueAtTime(0.0001, start);
    gain.gain.exponentialRampToValueAtTime(0.3, start + 0.02);
    gain.gain.exponentialRampToValueAtTime(0.0001, start + 0.16);
    osc.connect(gain).connect(context.destination);
    osc.start(start);
    osc.stop(start + 0.17);
  }
}
