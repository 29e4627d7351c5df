// Preload bridge: the renderer's only door to the back end. The IPC contract arrives with the desktop issue.
import { contextBridge } from 'electron';

contextBridge.exposeInMainWorld('tauwell', { version: '0.1.0' });
