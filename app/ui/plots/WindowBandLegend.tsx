/** Legend of the orbit bands shaded on every time plot (windowBands.ts): one entry per kind present. */
import { ECLIPSE_BAND_FILL, WINDOW_BAND_FILL, type WindowBand } from './windowBands';

export function WindowBandLegend({ bands }: { bands: readonly WindowBand[] }) {
  const sites = [...new Set(bands.filter((b) => b.kind === 'window').map((b) => b.label))];
  const eclipses = bands.some((b) => b.kind === 'eclipse');
  return (
    <span className="band-legend" data-testid="window-band-legend">
      {sites.length > 0 && (
        <span className="band-key" title={`Planned tracking windows: ${sites.join(', ')}`}>
          <span className="band-swatch" style={{ background: WINDOW_BAND_FILL }} />
          planned window (site or station named in the band)
        </span>
      )}
      {eclipses && (
        <span className="band-key" title="The spacecraft is in the Earth's shadow (penumbra or umbra, conical model)">
          <span className="band-swatch" style={{ background: ECLIPSE_BAND_FILL }} />
          eclipse
        </span>
      )}
    </span>
  );
}
