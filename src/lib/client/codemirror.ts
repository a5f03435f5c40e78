import { defaultKeymap, history, historyKeymap } from '@codemirror/commands';
import { python } from '@codemirror/lang-python';
import { bracketMatching, HighlightStyle, syntaxHighlighting } from '@codemirror/language';
import { highlightSelectionMatches, search, searchKeymap } from '@codemirror/search';
import { Compartment, EditorState, type Extension } from '@codemirror/state';
import { drawSelection, EditorView, highlightActiveLineGutter, highlightSpecialChars, keymap, lineNumbers } from '@codemirror/view';
import { tags } from '@lezer/highlight';

/*
 * Browser-only CodeMirror 6 set-up for the program viewer (STYLE.md §7). A minimal extension set instead of
 * `basicSetup` keeps the wizard's bundle small: line numbers, Python highlighting, search (Ctrl/Cmd-F), selection.
 * Colours are Phasewright's own (ink neutrals, tide accent), one set per theme.
 */

const LIGHT = { bg: '#ffffff', text: '#121a24', gutter: '#f5f7f9', gutterText: '#5b6f85', border: '#cdd7e1', selection: '#d5f3ef', active: '#e8edf2' };
const DARK = { bg: '#121a24', text: '#e8edf2', gutter: '#0a1017', gutterText: '#a3b3c4', border: '#2f3e50', selection: '#083a33', active: '#1f2a37' };

function createChromeTheme(c: typeof LIGHT, dark: boolean): Extension {
	return EditorView.theme(
		{
			'&': { backgroundColor: c.bg, color: c.text, fontSize: '0.8125rem' },
			'.cm-content': { fontFamily: '"Fira Mono", ui-monospace, monospace', caretColor: c.text },
			'.cm-scroller': { fontFamily: '"Fira Mono", ui-monospace, monospace', lineHeight: '1.5' },
			'.cm-gutters': { backgroundColor: c.gutter, color: c.gutterText, borderRight: `1px solid ${c.border}` },
			'.cm-activeLineGutter': { backgroundColor: c.active },
			'&.cm-focused': { outline: '2px solid #1f9e8f', outlineOffset: '-2px' },
			'&.cm-focused .cm-selectionBackground, .cm-selectionBackground, ::selection': { backgroundColor: c.selection },
			'.cm-searchMatch': { backgroundColor: dark ? '#0f6357' : '#7fd6cb', outline: `1px solid ${dark ? '#7fd6cb' : '#0f6357'}` },
			'.cm-searchMatch.cm-searchMatch-selected': { backgroundColor: dark ? '#15806f' : '#1f9e8f', color: '#ffffff' },
			'.cm-panels': { backgroundColor: c.gutter, color: c.text, borderColor: c.border },
			'.cm-panels input, .cm-panels button': { fontSize: '0.8125rem' }
		},
		{ dark }
	);
}

function createHighlight(dark: boolean): Extension {
	const k = dark
		? { keyword: '#7fd6cb', string: '#c4b5fd', comment: '#a3b3c4', number: '#7dd3fc', def: '#f5f7f9', builtin: '#a5f3fc' }
		: { keyword: '#0f6357', string: '#5b21b6', comment: '#5b6f85', number: '#075985', def: '#121a24', builtin: '#155e75' };
	return syntaxHighlighting(
		HighlightStyle.define([
			{ tag: [tags.keyword, tags.controlKeyword, tags.definitionKeyword, tags.moduleKeyword, tags.operatorKeyword], color: k.keyword, fontWeight: '600' },
			{ tag: [tags.string, tags.special(tags.string)], color: k.string },
			{ tag: [tags.comment, tags.lineComment], color: k.comment, fontStyle: 'italic' },
			{ tag: [tags.number, tags.bool, tags.null], color: k.number },
			{ tag: [tags.function(tags.definition(tags.variableName)), tags.definition(tags.className)], color: k.def, fontWeight: '600' },
			{ tag: [tags.standard(tags.variableName), tags.self], color: k.builtin }
		])
	);
}

function createThemeExtension(dark: boolean): Extension {
	return [createChromeTheme(dark ? DARK : LIGHT, dark), createHighlight(dark)];
}

function createEditingExtension(editable: boolean): Extension {
	// Read-only keeps the content focusable and selectable (for search and copying); only typing is refused.
	return editable ? [history(), keymap.of(historyKeymap), EditorState.readOnly.of(false)] : [EditorState.readOnly.of(true)];
}

export type CodeViewOptions = {
	parent: HTMLElement;
	text: string;
	dark: boolean;
	editable: boolean;
	/** Accessible name of the text area, e.g. "Rendered program". */
	label: string;
	onchange?: (text: string) => void;
};

export type CodeViewHandle = {
	/** Replace the whole document (no-op when unchanged); the view and its scroll position are kept. */
	setText(text: string): void;
	setDark(dark: boolean): void;
	setEditable(editable: boolean): void;
	getText(): string;
	/** Scroll a 1-based line into view and put the cursor on it. */
	revealLine(line: number): void;
	/** Select the whole document and focus it (the copy fallback: the reader presses Ctrl+C). */
	selectAll(): void;
	destroy(): void;
};

/** Mount a CodeMirror view in `parent`. Call only in the browser (onMount / $effect). */
export function createCodeView(options: CodeViewOptions): CodeViewHandle {
	const theme = new Compartment();
	const editing = new Compartment();
	const label = new Compartment();
	let onchange = options.onchange;
	// Set while a document change comes from `setText`, so it is not echoed back as a user edit.
	let applyingExternal = false;

	const contentLabel = (editable: boolean) =>
		// An explicit tabindex: axe does not count a contenteditable as focusable for scrollable regions.
		EditorView.contentAttributes.of({ 'aria-label': options.label, 'aria-readonly': editable ? 'false' : 'true', 'aria-multiline': 'true', tabindex: '0' });

	const view = new EditorView({
		parent: options.parent,
		state: EditorState.create({
			doc: options.text,
			extensions: [
				lineNumbers(),
				highlightActiveLineGutter(),
				highlightSpecialChars(),
				drawSelection(),
				bracketMatching(),
				python(),
				search({ top: true }),
				highlightSelectionMatches(),
				keymap.of([...searchKeymap, ...defaultKeymap]),
				theme.of(createThemeExtension(options.dark)),
				editing.of(createEditingExtension(options.editable)),
				label.of(contentLabel(options.editable)),
				EditorView.updateListener.of((update) => {
					if (update.docChanged && !applyingExternal) onchange?.(update.state.doc.toString());
				})
			]
		})
	});

	return {
		setText(text) {
			const current = view.state.doc.toString();
			if (current === text) return;
			// Replace only the part that differs (common prefix and suffix kept): a re-rendered
			// program usually changes a few lines, and CodeMirror then re-parses only those.
			const max = Math.min(current.length, text.length);
			let start = 0;
			while (start < max && current.charCodeAt(start) === text.charCodeAt(start)) start++;
			let end = 0;
			while (end < max - start && current.charCodeAt(current.length - 1 - end) === text.charCodeAt(text.length - 1 - end)) end++;
			applyingExternal = true;
			try {
				view.dispatch({ changes: { from: start, to: current.length - end, insert: text.slice(start, text.length - end) } });
			} finally {
				applyingExternal = false;
			}
		},
		setDark(dark) {
			view.dispatch({ effects: theme.reconfigure(createThemeExtension(dark)) });
		},
		setEditable(editable) {
			view.dispatch({ effects: [editing.reconfigure(createEditingExtension(editable)), label.reconfigure(contentLabel(editable))] });
		},
		getText() {
			return view.state.doc.toString();
		},
		revealLine(line) {
			const n = Math.min(Math.max(1, Math.round(line)), view.state.doc.lines);
			const pos = view.state.doc.line(n).from;
			view.dispatch({ selection: { anchor: pos }, effects: EditorView.scrollIntoView(pos, { y: 'center' }) });
		},
		selectAll() {
			view.dispatch({ selection: { anchor: 0, head: view.state.doc.length } });
			view.focus();
		},
		destroy() {
			onchange = undefined;
			view.destroy();
		}
	};
}
