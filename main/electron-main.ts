/**
 * The desktop entry point and the only main-process file that imports `electron`: it hands
 * Electron's modules and the scenario validator to main/app-main.ts. Everything with logic lives
 * there and in the modules it wires, which load (and are tested) without the Electron binary.
 */
import { app, BrowserWindow, dialog, ipcMain, Menu, protocol, session } from 'electron';
import { validateScenario } from '../app/engine/scenario/validate';
import { startDesktopApp } from './app-main';

startDesktopApp(
  { app, BrowserWindow, dialog, ipcMain, Menu, protocol, session },
  { mainDir: __dirname, argv: process.argv, cwd: process.cwd(), validateScenario },
);
