/**
 * The clinic's one date format, for every date on screen and on paper. Dates are stored as
 * calendar dates (YYYY-MM-DD) and instants (ISO 8601); only their display follows the setting.
 */
export const dateFormats = ['YYYY-MM-DD', 'DD/MM/YYYY', 'MM/DD/YYYY', 'D MMM YYYY'] as const;
export type DateFormat = (typeof dateFormats)[number];

/** The format when the clinic has not chosen one: the stored form, unambiguous everywhere. */
export const defaultDateFormat: DateFormat = 'YYYY-MM-DD';

export const dateFormatLabels: Readonly<Record<DateFormat, string>> = {
  'YYYY-MM-DD': '2026-12-02 (year-month-day)',
  'DD/MM/YYYY': '02/12/2026 (day/month/year)',
  'MM/DD/YYYY': '12/02/2026 (month/day/year)',
  'D MMM YYYY': '2 Dec 2026',
};

const monthNames = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];

/**
 * A calendar date ("2026-12-02", or the date part of an ISO instant already in local time) in the
 * clinic's format; text that is not a date is returned as it is.
 * @param isoDate YYYY-MM-DD
 * @param format one of dateFormats
 */
export function formatCalendarDate(isoDate: string, format: DateFormat): string {
  const match = /^(\d{4})-(\d{2})-(\d{2})/.exec(isoDate);
  if (match === null) return isoDate;
  const [, year = '', month = '', day = ''] = match;
  switch (format) {
    case 'YYYY-MM-DD':
      return `${year}-${month}-${day}`;
    case 'DD/MM/YYYY':
      return `${day}/${month}/${year}`;
    case 'MM/DD/YYYY':
      return `${month}/${day}/${year}`;
    case 'D MMM YYYY':
      return `${String(Number(day))} ${monthNames[Number(month) - 1] ?? month} ${year}`;
  }
}
