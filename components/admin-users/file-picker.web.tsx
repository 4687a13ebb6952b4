/** A real file input on the web; the chosen file goes up as multipart form data. */
export function FilePicker({ label, onPick }: { label: string; onPick: (file: File) => void }) {
  return (
    <input
      type="file"
      accept=".csv,text/csv"
      aria-label={label}
      // 48 px tall: a gloved finger needs at least 44 (WCAG 2.5.5).
      style={{ fontSize: 16, padding: 8, minHeight: 48, boxSizing: 'border-box', cursor: 'pointer' }}
      onChange={(e) => {
        const file = e.currentTarget.files?.[0];
        if (file) onPick(file);
        e.currentTarget.value = '';
      }}
    />
  );
}
