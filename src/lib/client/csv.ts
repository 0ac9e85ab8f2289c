/** Tables downloaded as CSV files in the browser, written by the shared writer. */
import { CSV_CONTENT_TYPE, csvFilename, toCsv, type CsvCell } from '$lib/csv/write';

export function downloadCsv(filename: string, header: readonly string[], rows: readonly (readonly CsvCell[])[]): void {
	const url = URL.createObjectURL(new Blob([toCsv(header, rows)], { type: CSV_CONTENT_TYPE }));
	const a = document.createElement('a');
	a.href = url;
	a.download = csvFilename(filename);
	document.body.append(a);
	a.click();
	a.remove();
	setTimeout(() => URL.revokeObjectURL(url), 1000);
}
