// Sandboxed preload: exposes two narrow functions. Channel names come from the main process, so
// the renderer can reach only the contract's channels and nothing else of Electron or Node.
import electron = require('electron');

const allowedChannels = new Set<string>(electron.ipcRenderer.sendSync('tidewing:channel-list') as string[]);

electron.contextBridge.exposeInMainWorld('tidewing', {
  invoke(channel: string, request: unknown): Promise<unknown> {
    if (typeof channel !== 'string' || !allowedChannels.has(channel)) {
      return Promise.resolve({
        ok: false,
        error: { code: 'unknown-channel', message: `There is no channel called ${String(channel)}.` },
      });
    }
    return electron.ipcRenderer.invoke(channel, request);
  },
  /** Prints the shown worksheet to a PDF file the user picks; only a suggested file name crosses over. */
  saveWorksheetPdf(suggestedName: string): Promise<unknown> {
    return electron.ipcRenderer.invoke(
      'tidewing:worksheet-pdf',
      typeof suggestedName === 'string' ? suggestedName : '',
    );
  },
});
