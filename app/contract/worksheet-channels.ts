import { z } from 'zod';

/**
 * Where the printed worksheet is kept as a PDF file. The desktop window prints its own page and
 * asks where to save it; the browser host cannot write where the user chooses, so there the
 * channel answers 'unavailable' and the screen offers the browser's Print instead.
 */
export const worksheetChannels = {
  'worksheets:save-pdf': {
    request: z
      .object({
        /** File name offered in the save dialog; the desktop keeps letters, digits and hyphens only. */
        suggestedName: z
          .string()
          .max(200, { error: 'The suggested file name must be at most 200 characters.' }),
      })
      .strict(),
    response: z.union([
      z.object({ saved: z.literal(true), file: z.string() }),
      /** The user closed the save dialog without choosing a file. */
      z.object({ saved: z.literal(false) }),
    ]),
  },
} as const;

/** What the browser host answers on 'worksheets:save-pdf', in words a clinic user can act on. */
export const worksheetPdfUnavailableMessage =
  "Saving a PDF is not available here: use the browser's Print (choose Save as PDF as the printer), or `npx tidewing worksheet`.";
