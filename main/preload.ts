/**
 * Preload (sandboxed, context-isolated): exposes the typed bridge and nothing else.
 * Built as one CommonJS file that requires only `electron`, as sandboxed preloads must be.
 */
import { contextBridge, ipcRenderer } from 'electron';
import { createDesktopBridge } from './preload-api';

contextBridge.exposeInMainWorld('slewsmith', createDesktopBridge(ipcRenderer));
