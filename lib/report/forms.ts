/**
 * Forms (PDF form XObjects): a drawing made once per document and placed wherever it recurs, so its
 * operators are written once rather than at every place: the footer's QR code on every page, and the
 * chart markers and cross-section points of every traverse.
 */
import { drawObject, popGraphicsState, pushGraphicsState, translate, type PDFDocument, type PDFName, type PDFOperator, type PDFPage, type PDFRef } from "pdf-lib";

const made = new WeakMap<PDFDocument, Map<string, PDFRef>>();
/** The name each page's resources know a form by: one entry per page and form, however often it is placed. */
const names = new WeakMap<PDFPage, Map<PDFRef, PDFName>>();

/**
 * The document's form for `key`, drawn by `operators` the first time it is asked for. `box` is
 * [left, bottom, right, top] around the form's origin: viewers clip the form to it.
 */
export function formFor(doc: PDFDocument, key: string, box: [number, number, number, number], operators: () => PDFOperator[]): PDFRef {
  let forms = made.get(doc);
  if (forms === undefined) {
    forms = new Map();
    made.set(doc, forms);
  }
  let ref = forms.get(key);
  if (ref === undefined) {
    ref = doc.context.register(doc.context.formXObject(operators(), { BBox: box }));
    forms.set(key, ref);
  }
  return ref;
}

/** Places a form with its origin at (x, y). */
export function placeForm(page: PDFPage, form: PDFRef, x: number, y: number): void {
  let pageNames = names.get(page);
  if (pageNames === undefined) {
    pageNames = new Map();
    names.set(page, pageNames);
  }
  let name = pageNames.get(form);
  if (name === undefined) {
    name = page.node.newXObject("Fm", form);
    pageNames.set(form, name);
  }
  page.pushOperators(pushGraphicsState(), translate(x, y), drawObject(name), popGraphicsState());
}
