/**
 * Short tones for the scan box, made with WebAudio (no sound files): a rising pair for a
 * move made, a low buzz for a refusal. Muting is remembered in this browser.
 */
const KEY = 'sy_sound_muted';
let ctx: AudioContext | null = null;

export function isMuted(): boolean {
	try {
		return localStorage.getItem(KEY) === '1';
	} catch {
		return false;
	}
}

export function setMuted(muted: boolean): void {
	try {
		localStorage.setItem(KEY, muted ? '1' : '0');
	} catch {
		/* private mode: the choice lasts this page only */
	}
}

function tone(freq: number, start: number, length: number, type: OscillatorType, gain = 0.18) {
	if (!ctx) return;
	const osc = ctx.createOscillator();
	const amp = ctx.createGain();
	osc.type = type;
	osc.frequency.value = freq;
	amp.gain.setValueAtTime(0.0001, ctx.currentTime + start);
	amp.gain.exponentialRampToValueAtTime(gain, ctx.currentTime + start + 0.01);
	amp.gain.exponentialRampToValueAtTime(0.0001, ctx.currentTime + start + length);
	osc.connect(amp).connect(ctx.destination);
	osc.start(ctx.currentTime + start);
	osc.stop(ctx.currentTime + start + length + 0.02);
}

export function play(kind: 'ok' | 'refused'): void {
	if (isMuted() || typeof window === 'undefined') return;
	try {
		ctx ??= new (window.AudioContext ?? (window as unknown as { webkitAudioContext: typeof AudioContext }).webkitAudioContext)();
		if (ctx.state === 'suspended') void ctx.resume();
		if (kind === 'ok') {
			tone(660, 0, 0.09, 'sine');
			tone(990, 0.1, 0.12, 'sine');
		} else {
			tone(180, 0, 0.35, 'square', 0.12);
		}
	} catch {
		/* no audio on this device */
	}
}
