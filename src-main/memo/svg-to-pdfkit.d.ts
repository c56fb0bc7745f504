// Types for svg-to-pdfkit 0.1.8 (the package ships none): the options the memo uses.
declare module 'svg-to-pdfkit' {
  interface SvgToPdfOptions {
    width?: number;
    height?: number;
    preserveAspectRatio?: string;
    useCSS?: boolean;
    assumePt?: boolean;
    precision?: number;
    fontCallback?: (family: string, bold: boolean, italic: boolean, options: Record<string, unknown>) => string;
    imageCallback?: (link: string) => string;
    colorCallback?: (colour: [number[], number]) => [number[], number];
    warningCallback?: (message: string) => void;
    documentCallback?: (file: string) => unknown;
  }
  function SVGtoPDF(doc: PDFKit.PDFDocument, svg: string, x: number, y: number, options?: SvgToPdfOptions): void;
  export default SVGtoPDF;
}
