/**
 * Marks the array formulas of an .xlsx file as dynamic arrays, the way Excel 365 saves a formula
 * whose result spills: the anchor cell carries `cm="1"`, which points at cell metadata of type
 * XLDAPR with the dynamic-array property fDynamic (MS-XLSX, "dynamicArrayProperties", namespace
 * http://schemas.microsoft.com/office/spreadsheetml/2017/dynamicarray), in the part
 * xl/metadata.xml linked from the workbook. Without the mark Excel treats such a formula as a
 * legacy array formula of fixed size, shown in braces; with it, the result re-spills to the size
 * it needs when its data change. exceljs writes array formulas but cannot write this mark, so it
 * is added to the zip package afterwards.
 */
import JSZip from 'jszip';

const MAIN_NS = 'http://schemas.openxmlformats.org/spreadsheetml/2006/main';
const DA_NS = 'http://schemas.microsoft.com/office/spreadsheetml/2017/dynamicarray';
/** Extension URI under which Excel keeps dynamic-array properties. */
const DA_EXT_URI = '{bdbb8cdc-fa1e-496e-a857-3c3f30c029c3}';
const META_REL_TYPE = 'http://schemas.openxmlformats.org/officeDocument/2006/relationships/sheetMetadata';
const META_CONTENT_TYPE = 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheetMetadata+xml';

/** The metadata part: one cell-metadata record (index 1) meaning "dynamic array". */
export const METADATA_XML =
  '<?xml version="1.0" encoding="UTF-8" standalone="yes"?>\n' +
  `<metadata xmlns="${MAIN_NS}" xmlns:xda="${DA_NS}">` +
  '<metadataTypes count="1">' +
  '<metadataType name="XLDAPR" minSupportedVersion="120000" copy="1" pasteAll="1" pasteValues="1" merge="1" splitFirst="1" rowColShift="1" clearFormats="1" clearComments="1" assign="1" coerce="1" cellMeta="1"/>' +
  '</metadataTypes>' +
  '<futureMetadata name="XLDAPR" count="1"><bk><extLst>' +
  `<ext uri="${DA_EXT_URI}"><xda:dynamicArrayProperties fDynamic="1" fCollapsed="0"/></ext>` +
  '</extLst></bk></futureMetadata>' +
  '<cellMetadata count="1"><bk><rc t="1" v="0"/></bk></cellMetadata>' +
  '</metadata>';

/**
 * Adds the dynamic-array mark to every array-formula anchor of every worksheet in `xlsx`.
 * A package that already has a metadata part is returned unchanged (its indices are unknown).
 * Cost: O(size of the package).
 * @param xlsx the bytes of an .xlsx file (as exceljs writes it).
 * @returns the bytes of the marked package and the number of cells marked.
 */
export async function markDynamicArrays(xlsx: Uint8Array): Promise<{ bytes: Uint8Array; marked: number }> {
  const zip = await JSZip.loadAsync(xlsx);
  if (zip.file('xl/metadata.xml')) return { bytes: xlsx, marked: 0 };
  let marked = 0;
  for (const name of Object.keys(zip.files).filter((n) => /^xl\/worksheets\/[^/]+\.xml$/.test(n))) {
    const xml = await zip.file(name)!.async('string');
    // An anchor: <c r="D2" …><f t="array" ref="…">; other cells keep their tags.
    const next = xml.replace(/<c (r="[A-Z]+[0-9]+")((?:\s+(?!cm=)[a-z]+="[^"]*")*)>(<f t="array" )/g, (_m, r: string, rest: string, f: string) => {
      marked++;
      return `<c ${r}${rest} cm="1">${f}`;
    });
    if (next !== xml) zip.file(name, next);
  }
  if (marked === 0) return { bytes: xlsx, marked };
  zip.file('xl/metadata.xml', METADATA_XML);
  const types = await zip.file('[Content_Types].xml')!.async('string');
  zip.file('[Content_Types].xml', types.replace('</Types>', `<Override PartName="/xl/metadata.xml" ContentType="${META_CONTENT_TYPE}"/></Types>`));
  const relsName = 'xl/_rels/workbook.xml.rels';
  const rels = await zip.file(relsName)!.async('string');
  const ids = new Set([...rels.matchAll(/Id="([^"]+)"/g)].map((m) => m[1]));
  let n = ids.size + 1;
  while (ids.has(`rId${n}`)) n++;
  zip.file(relsName, rels.replace('</Relationships>', `<Relationship Id="rId${n}" Type="${META_REL_TYPE}" Target="metadata.xml"/></Relationships>`));
  const bytes = await zip.generateAsync({ type: 'uint8array', compression: 'DEFLATE' });
  return { bytes, marked };
}
