// Types for the npm package `commonmark` (the CommonMark reference parser), used only in tests to
// check that build-supplied text rendered in our Markdown forms no headings, images, links or HTML.
declare module 'commonmark' {
  export class Parser {
    parse(text: string): unknown;
  }
  export class HtmlRenderer {
    render(document: unknown): string;
  }
}
