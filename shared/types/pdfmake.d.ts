// The small part of pdfmake 0.3 (server build) that Tessera uses; the package ships no types.
declare module 'pdfmake' {
  interface OutputDocument { getBuffer(): Promise<Buffer> }
  interface PdfMake {
    virtualfs: { writeFileSync(name: string, content: Buffer): void; existsSync(name: string): boolean }
    setFonts(fonts: Record<string, { normal: string; bold: string; italics: string; bolditalics: string }>): void
    setUrlAccessPolicy(policy: (url: string) => boolean): void
    setLocalAccessPolicy(policy: (path: string) => boolean): void
    createPdf(definition: object, options?: object): OutputDocument
  }
  const pdfmake: PdfMake
  export default pdfmake
}
