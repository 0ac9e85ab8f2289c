/**
 * Traveler barcodes: the shop serial as Code 128 (ISO/IEC 15417) for hand scanners and as a
 * DataMatrix (ISO/IEC 16022, ECC 200) for phone cameras, drawn by bwip-js. PNGs are on white
 * with a quiet zone around the symbol so any reader finds it (Code 128 needs at least ten
 * modules of quiet zone each side; DataMatrix one module, we give more).
 */
import bwipjs from 'bwip-js/node';

export const SYMBOLOGIES = ['code128', 'datamatrix'] as const;
export type Symbology = (typeof SYMBOLOGIES)[number];

export function isSymbology(v: unknown): v is Symbology {
	return typeof v === 'string' && (SYMBOLOGIES as readonly string[]).includes(v);
}

function options(symbology: Symbology, text: string, scale: number) {
	return symbology === 'code128'
		? { bcid: 'code128', text, scale, height: 12, includetext: false, paddingwidth: 12, paddingheight: 4, backgroundcolor: 'FFFFFF' }
		: { bcid: 'datamatrix', text, scale, paddingwidth: 4, paddingheight: 4, backgroundcolor: 'FFFFFF' };
}

export function barcodeSvg(symbology: Symbology, text: string): string {
	return bwipjs.toSVG(options(symbology, text, 1));
}

export function barcodePng(symbology: Symbology, text: string, scale = 3): Promise<Buffer> {
	return bwipjs.toBuffer(options(symbology, text, scale));
}
