/**
 * Readings with no oscillation have no frequency to plot, yet the operator
 * should see them arrive (a sweep often starts in the stalled region). They
 * are drawn as small crosses along the bottom edge of the plot at their
 * control voltage — on the canvas, after the series, without touching the
 * y range.
 */
import type uPlot from 'uplot';

export function deadMarksPlugin(getXs: () => readonly number[], getColor: () => string): uPlot.Plugin {
  return {
    hooks: {
      draw: (u) => {
        const xs = getXs();
        if (xs.length === 0) return;
        const { ctx } = u;
        const ratio = window.devicePixelRatio || 1;
        const size = 3.5 * ratio;
        const y = u.bbox.top + u.bbox.height - size - 2 * ratio;
        ctx.save();
        ctx.strokeStyle = getColor();
        ctx.lineWidth = 1.5 * ratio;
        ctx.beginPath();
        for (const value of xs) {
          const x = u.valToPos(value, 'x', true);
          if (x < u.bbox.left || x > u.bbox.left + u.bbox.width) continue;
          ctx.moveTo(x - size, y - size);
          ctx.lineTo(x + size, y + size);
          ctx.moveTo(x + size, y - size);
          ctx.lineTo(x - size, y + size);
        }
        ctx.stroke();
        ctx.restore();
      },
    },
  };
}
