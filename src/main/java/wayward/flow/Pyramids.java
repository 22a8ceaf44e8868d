package wayward.flow;

/** Image pyramids by 2×2 area means; shared by the estimators. Allocation-free. */
final class Pyramids {
    private Pyramids() {
    }

    /**
     * Fills {@code pyramid[0]} with the frame as floats and each further level with the 2×2 mean of the one
     * before; level sizes are floor(previous / 2), so every source pixel read is in range.
     */
    static void build(byte[] frame, float[][] pyramid, int[] widths, int[] heights) {
        final float[] base = pyramid[0];
        for (int i = 0; i < base.length; i++) {
            base[i] = frame[i] & 0xff;
        }
        for (int l = 1; l < pyramid.length; l++) {
            halve(pyramid[l - 1], widths[l - 1], pyramid[l], widths[l], heights[l]);
        }
    }

    /**
     * Like {@link #build}, but each level is low-passed before it is halved: the 2×2 mean widened by a
     * [1 2 1]/4 binomial, i.e. [1 3 3 1]/8 per axis around the coarse pixel's centre, so fine texture does not
     * alias into false structure on the coarse levels (common practice: Burt &amp; Adelson 1983).
     * {@code scratch} holds at least (level-0 height) × (level-1 width) floats.
     */
    static void buildSmooth(byte[] frame, float[][] pyramid, int[] widths, int[] heights, float[] scratch) {
        final float[] base = pyramid[0];
        for (int i = 0; i < base.length; i++) {
            base[i] = frame[i] & 0xff;
        }
        for (int l = 1; l < pyramid.length; l++) {
            halveSmooth(pyramid[l - 1], widths[l - 1], heights[l - 1], pyramid[l], widths[l], heights[l], scratch);
        }
    }

    static void halveSmooth(float[] fine, int fw, int fh, float[] coarse, int w, int h, float[] tmp) {
        smoothRows(fine, fw, tmp, w, 0, fh);
        smoothColumns(tmp, fh, coarse, w, 0, h);
    }

    /** Level 0 rows [y0, y1) from the frame's bytes. */
    static void convertRows(byte[] frame, float[] base, int w, int y0, int y1) {
        for (int i = y0 * w; i < y1 * w; i++) {
            base[i] = frame[i] & 0xff;
        }
    }

    /** Horizontal half of {@link #halveSmooth} for fine rows [y0, y1): [1 3 3 1]/8 around each coarse column. */
    static void smoothRows(float[] fine, int fw, float[] tmp, int w, int y0, int y1) {
        final int lastX = fw - 1;
        for (int y = y0; y < y1; y++) {
            final int row = y * fw;
            final int out = y * w;
            for (int x = 0; x < w; x++) {
                final int c = 2 * x;
                final int a = c > 0 ? c - 1 : 0;
                final int d = c + 2 <= lastX ? c + 2 : lastX;
                tmp[out + x] = 0.125f * (fine[row + a] + 3f * (fine[row + c] + fine[row + c + 1]) + fine[row + d]);
            }
        }
    }

    /** Vertical half of {@link #halveSmooth} for coarse rows [y0, y1). */
    static void smoothColumns(float[] tmp, int fh, float[] coarse, int w, int y0, int y1) {
        final int lastY = fh - 1;
        for (int y = y0; y < y1; y++) {
            final int c = 2 * y;
            final int ra = (c > 0 ? c - 1 : 0) * w;
            final int rb = c * w;
            final int rc = (c + 1) * w;
            final int rd = (c + 2 <= lastY ? c + 2 : lastY) * w;
            final int out = y * w;
            for (int x = 0; x < w; x++) {
                coarse[out + x] = 0.125f * (tmp[ra + x] + 3f * (tmp[rb + x] + tmp[rc + x]) + tmp[rd + x]);
            }
        }
    }

    static void halve(float[] fine, int fineWidth, float[] coarse, int w, int h) {
        for (int y = 0; y < h; y++) {
            final int r0 = 2 * y * fineWidth;
            final int r1 = r0 + fineWidth;
            final int out = y * w;
            for (int x = 0; x < w; x++) {
                final int c = 2 * x;
                coarse[out + x] = 0.25f * (fine[r0 + c] + fine[r0 + c + 1] + fine[r1 + c] + fine[r1 + c + 1]);
            }
        }
    }
}
