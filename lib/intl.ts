/**
 * The one way to get an `Intl.NumberFormat`: built once per locale and options, then reused.
 * Building one costs far more than formatting with it, and pages, PDFs and e-mails format
 * thousands of figures. Pure; safe in client components.
 */
const formats = new Map<string, Intl.NumberFormat>();

export function numberFormat(locale: string, options: Intl.NumberFormatOptions): Intl.NumberFormat {
  const key = `${locale}|${JSON.stringify(options)}`;
  let f = formats.get(key);
  if (!f) formats.set(key, (f = new Intl.NumberFormat(locale, options)));
  return f;
}
