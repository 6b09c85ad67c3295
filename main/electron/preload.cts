// Sandboxed preload: exposes one function, `invoke`. Channel names come from the main process, so
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
});
