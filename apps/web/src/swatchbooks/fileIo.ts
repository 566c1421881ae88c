/** File download and reading, swappable in tests (jsdom has no object URLs or real downloads). */
export const files = {
  download(name: string, text: string): void {
    const url = URL.createObjectURL(new Blob([text], { type: 'application/json' }));
    const a = document.createElement('a');
    a.href = url;
    a.download = name;
    document.body.appendChild(a);
    a.click();
    a.remove();
    setTimeout(() => URL.revokeObjectURL(url), 1000);
  },
  read(file: File): Promise<string> {
    return file.text();
  },
};

/** "Quillmere blues" -> "quillmere-blues.swatchbook.json" */
export function exportFileName(name: string): string {
  const slug = name.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-+|-+$/g, '') || 'swatchbook';
  return `${slug}.swatchbook.json`;
}
