/** The bundled generic bus (assets/bus-model.json), checked once at load. */
import raw from '../../assets/bus-model.json';
import { unwrap } from '../engine/errors';
import type { BusModel } from './busModel';
import { parseBusModel } from './busModel';

export const DEFAULT_BUS_MODEL: BusModel = unwrap(parseBusModel(raw));
