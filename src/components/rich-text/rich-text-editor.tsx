// The rich-text editor for articles and guide steps: TipTap with Beadpath's extensions, a toolbar
// that works by keyboard and touch, photo upload with alt text (button, paste or drop), links,
// tables and caution blocks.
import { EditorContent, useEditor, useEditorState, type Editor } from '@tiptap/react';
import { useEffect, useRef, useState, type FormEvent, type ReactNode } from 'react';
import { HAZARDS, HAZARD_KEYS, type Hazard } from '@/shared/tags';
import { richTextExtensions, type TipTapNode } from '@/shared/rich-text/extensions';
import { errorMessage } from '@/lib/api-client';
import { showToast } from '@/lib/toasts';
import { Button } from '@/components/ui/button';
import { Dialog } from '@/components/ui/dialog';
import { TextField, SelectField } from '@/components/ui/field';

export interface RichTextEditorProps {
  value: TipTapNode;
  onChange: (doc: TipTapNode) => void;
  /** Uploads a photo and answers the URL to show it at. */
  upload: (file: File) => Promise<string>;
  label: string;
  placeholder?: string;
  /** Uploads a document (a PDF manual or safety data sheet) and answers where to link to it. */
  attach?: (file: File) => Promise<{ href: string; name: string }>;
}

function ToolButton({ onClick, active, disabled, label, children }: { onClick: () => void; active?: boolean; disabled?: boolean; label: string; children: ReactNode }) {
  return (
    <button
      type="button"
      onMouseDown={(e) => e.preventDefault()}
      onClick={onClick}
      disabled={disabled}
      aria-pressed={active}
      aria-label={label}
      title={label}
      className={`min-h-11 min-w-11 rounded px-2 text-sm font-semibold ${active ? 'bg-amber-wash text-amber-deep' : 'text-ink hover:bg-paper-sunk'} disabled:opacity-40`}
    >
      {children}
    </button>
  );
}

const IMAGE_TYPES = ['image/jpeg', 'image/png', 'image/webp'];

export function RichTextEditor({ value, onChange, upload, label, attach }: RichTextEditorProps) {
  const docInput = useRef<HTMLInputElement>(null);
  const [pendingImage, setPendingImage] = useState<{ file: File; pos?: number } | null>(null);
  const [alt, setAlt] = useState('');
  const [uploading, setUploading] = useState(false);
  const [linkOpen, setLinkOpen] = useState(false);
  const [href, setHref] = useState('');
  const [cautionOpen, setCautionOpen] = useState(false);
  const [hazard, setHazard] = useState<Hazard>('mechanical');
  const fileInput = useRef<HTMLInputElement>(null);
  const onChangeRef = useRef(onChange);
  onChangeRef.current = onChange;

  const editor = useEditor({
    extensions: richTextExtensions(),
    content: value,
    immediatelyRender: true,
    editorProps: {
      attributes: { class: 'prose-bp min-h-64 px-4 py-3 focus:outline-none', 'aria-label': label, role: 'textbox', 'aria-multiline': 'true' },
      handlePaste: (view, event) => {
        const file = Array.from(event.clipboardData?.files ?? []).find((f) => IMAGE_TYPES.includes(f.type));
        if (!file) return false;
        setPendingImage({ file });
        return true;
      },
      handleDrop: (view, event) => {
        const file = Array.from(event.dataTransfer?.files ?? []).find((f) => IMAGE_TYPES.includes(f.type));
        if (!file) return false;
        const pos = view.posAtCoords({ left: event.clientX, top: event.clientY })?.pos;
        setPendingImage({ file, pos });
        return true;
      },
    },
    onUpdate: ({ editor: e }) => onChangeRef.current(e.getJSON() as TipTapNode),
  });

  // Content replaced from outside (conflict resolution, restore) is loaded without an undo step.
  useEffect(() => {
    if (editor && JSON.stringify(editor.getJSON()) !== JSON.stringify(value)) editor.commands.setContent(value, { emitUpdate: false });
  }, [editor, value]);

  const state = useEditorState({
    editor,
    selector: ({ editor: e }: { editor: Editor | null }) =>
      e
        ? {
            bold: e.isActive('bold'),
            italic: e.isActive('italic'),
            h2: e.isActive('heading', { level: 2 }),
            h3: e.isActive('heading', { level: 3 }),
            bullet: e.isActive('bulletList'),
            ordered: e.isActive('orderedList'),
            link: e.isActive('link'),
            table: e.isActive('table'),
            caution: e.isActive('caution'),
            canUndo: e.can().undo(),
            canRedo: e.can().redo(),
          }
        : null,
  });

  if (!editor || !state) return null;

  async function insertImage(e: FormEvent) {
    e.preventDefault();
    if (!pendingImage || !editor) return;
    if (!alt.trim()) return;
    setUploading(true);
    try {
      const src = await upload(pendingImage.file);
      const chain = editor.chain().focus();
      if (pendingImage.pos !== undefined) chain.insertContentAt(pendingImage.pos, { type: 'image', attrs: { src, alt: alt.trim() } }).run();
      else chain.setImage({ src, alt: alt.trim() }).run();
      setPendingImage(null);
      setAlt('');
    } catch (err) {
      showToast(`The photo was not added: ${errorMessage(err)}`, 'error');
    } finally {
      setUploading(false);
    }
  }

  function applyLink(e: FormEvent) {
    e.preventDefault();
    if (!editor) return;
    const url = href.trim();
    if (!url) editor.chain().focus().extendMarkRange('link').unsetLink().run();
    else
      editor
        .chain()
        .focus()
        .extendMarkRange('link')
        .setLink({ href: /^(https?:|mailto:|\/)/i.test(url) ? url : `https://${url}` })
        .run();
    setLinkOpen(false);
  }

  return (
    <div className="rounded-md border border-rule-strong bg-paper-raised">
      <div role="toolbar" aria-label={`${label} formatting`} className="sticky top-14 z-10 flex flex-wrap gap-1 border-b border-rule bg-paper-raised p-1">
        <ToolButton label="Heading" active={state.h2} onClick={() => editor.chain().focus().toggleHeading({ level: 2 }).run()}>
          H2
        </ToolButton>
        <ToolButton label="Subheading" active={state.h3} onClick={() => editor.chain().focus().toggleHeading({ level: 3 }).run()}>
          H3
        </ToolButton>
        <ToolButton label="Bold" active={state.bold} onClick={() => editor.chain().focus().toggleBold().run()}>
          B
        </ToolButton>
        <ToolButton label="Italic" active={state.italic} onClick={() => editor.chain().focus().toggleItalic().run()}>
          <i>I</i>
        </ToolButton>
        <ToolButton label="Bulleted list" active={state.bullet} onClick={() => editor.chain().focus().toggleBulletList().run()}>
          • List
        </ToolButton>
        <ToolButton label="Numbered steps" active={state.ordered} onClick={() => editor.chain().focus().toggleOrderedList().run()}>
          1. Steps
        </ToolButton>
        <ToolButton
          label="Link"
          active={state.link}
          onClick={() => {
            setHref(String(editor.getAttributes('link').href ?? ''));
            setLinkOpen(true);
          }}
        >
          Link
        </ToolButton>
        <ToolButton label="Photo" onClick={() => fileInput.current?.click()}>
          Photo
        </ToolButton>
        {attach ? (
          <ToolButton label="Attach a PDF" onClick={() => docInput.current?.click()}>
            PDF
          </ToolButton>
        ) : null}
        <ToolButton label="Table" active={state.table} onClick={() => editor.chain().focus().insertTable({ rows: 3, cols: 3, withHeaderRow: true }).run()}>
          Table
        </ToolButton>
        {state.table ? (
          <>
            <ToolButton label="Add row" onClick={() => editor.chain().focus().addRowAfter().run()}>
              +Row
            </ToolButton>
            <ToolButton label="Add column" onClick={() => editor.chain().focus().addColumnAfter().run()}>
              +Col
            </ToolButton>
            <ToolButton label="Delete table" onClick={() => editor.chain().focus().deleteTable().run()}>
              −Table
            </ToolButton>
          </>
        ) : null}
        <ToolButton label="Caution" active={state.caution} onClick={() => (state.caution ? editor.chain().focus().lift('caution').run() : setCautionOpen(true))}>
          <span className="text-danger">⚠</span> Caution
        </ToolButton>
        <span className="mx-1 w-px bg-rule" aria-hidden />
        <ToolButton label="Undo" disabled={!state.canUndo} onClick={() => editor.chain().focus().undo().run()}>
          Undo
        </ToolButton>
        <ToolButton label="Redo" disabled={!state.canRedo} onClick={() => editor.chain().focus().redo().run()}>
          Redo
        </ToolButton>
        {attach ? (
          <input
            ref={docInput}
            type="file"
            accept="application/pdf"
            className="hidden"
            aria-label="Choose a PDF"
            onChange={async (e) => {
              const f = e.target.files?.[0];
              e.target.value = '';
              if (!f) return;
              try {
                const { href, name } = await attach(f);
                editor
                  .chain()
                  .focus()
                  .insertContent([
                    { type: 'text', text: `${name} (PDF)`, marks: [{ type: 'link', attrs: { href } }] },
                    { type: 'text', text: ' ' },
                  ])
                  .run();
              } catch (err) {
                showToast(`The document was not attached: ${errorMessage(err)}`, 'error');
              }
            }}
          />
        ) : null}
        <input
          ref={fileInput}
          type="file"
          accept="image/jpeg,image/png,image/webp"
          className="hidden"
          aria-label="Choose a photo"
          onChange={(e) => {
            const f = e.target.files?.[0];
            if (f) setPendingImage({ file: f });
            e.target.value = '';
          }}
        />
      </div>
      <EditorContent editor={editor} />

      <Dialog open={pendingImage !== null} title="Describe the photo" onClose={() => setPendingImage(null)}>
        <form onSubmit={insertImage} className="space-y-4">
          <p className="text-ink-soft">{pendingImage?.file.name}</p>
          <TextField
            label="What does the photo show?"
            hint="Said aloud by screen readers and shown if the photo cannot load, e.g. “Seat with a ring of cured glue at the orifice”."
            value={alt}
            onChange={(e) => setAlt(e.target.value)}
            autoFocus
            required
          />
          <div className="flex justify-end gap-2">
            <Button variant="secondary" onClick={() => setPendingImage(null)}>
              Cancel
            </Button>
            <Button type="submit" busy={uploading} disabled={!alt.trim()}>
              Add photo
            </Button>
          </div>
        </form>
      </Dialog>

      <Dialog open={linkOpen} title="Link" onClose={() => setLinkOpen(false)}>
        <form onSubmit={applyLink} className="space-y-4">
          <TextField label="Address" placeholder="https://… or /articles/12" value={href} onChange={(e) => setHref(e.target.value)} autoFocus hint="Leave empty to remove the link." />
          <div className="flex justify-end gap-2">
            <Button variant="secondary" onClick={() => setLinkOpen(false)}>
              Cancel
            </Button>
            <Button type="submit">Apply</Button>
          </div>
        </form>
      </Dialog>

      <Dialog open={cautionOpen} title="Add a caution" onClose={() => setCautionOpen(false)}>
        <form
          onSubmit={(e) => {
            e.preventDefault();
            editor.chain().focus().setCaution(hazard).run();
            setCautionOpen(false);
          }}
          className="space-y-4"
        >
          <p className="text-ink-soft">The selected paragraphs become a caution. Say what the danger is and what to do before going on.</p>
          <SelectField label="Hazard" value={hazard} onChange={(e) => setHazard(e.target.value as Hazard)}>
            {HAZARD_KEYS.map((h) => (
              <option key={h} value={h}>
                {HAZARDS[h]}
              </option>
            ))}
          </SelectField>
          <div className="flex justify-end gap-2">
            <Button variant="secondary" onClick={() => setCautionOpen(false)}>
              Cancel
            </Button>
            <Button type="submit" variant="danger">
              Add caution
            </Button>
          </div>
        </form>
      </Dialog>
    </div>
  );
}
