// Sandboxed preload: exposes `invoke` and `onChange`. Channel names come from the main process, so
// the renderer can reach only the contract's channels and nothing else of Electron or Node;
// `onChange` hands the listener each change notice's plain data, never the IPC event.
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
  onChange(listener: (notice: unknown) => void): () => void {
    if (typeof listener !== 'function') return () => undefined;
    const forward = (_event: unknown, notice: unknown) => listener(notice);
    electron.ipcRenderer.on('tidewing:change', forward);
    return () => {
      electron.ipcRenderer.removeListener('tidewing:change', forward);
    };
  },
});
