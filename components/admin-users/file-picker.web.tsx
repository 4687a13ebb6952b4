/** A real file input on the web; the chosen file goes up as multipart form data. */
export function FilePicker({ label, onPick }: { label: string; onPick: (file: File) => void }) {
  return (
    <input
      type="file"
      accept=".csv,text/csv"
      aria-label={label}
      style={{ fontSize: 16, padding: 8 }}
      onChange={(e) => {
        const file = e.currentTarget.files?.[0];
        if (file) onPick(file);
        e.currentTarget.value = '';
      }}
    />
  );
}
