/** Tables as CSV files (RFC 4180 quoting), downloaded in the browser. */
export function toCsv(rows: readonly (readonly (string | number | null)[])[]): string {
	const cell = (v: string | number | null) => {
		const s = v === null ? '' : String(v);
		return /[",\r\n]/.test(s) ? `"${s.replaceAll('"', '""')}"` : s;
	};
	return rows.map((r) => r.map(cell).join(',')).join('\r\n') + '\r\n';
}

export function downloadCsv(filename: string, rows: readonly (readonly (string | number | null)[])[]): void {
	const url = URL.createObjectURL(new Blob([toCsv(rows)], { type: 'text/csv;charset=utf-8' }));
	const a = document.createElement('a');
	a.href = url;
	a.download = filename;
	a.click();
	setTimeout(() => URL.revokeObjectURL(url), 1000);
}
