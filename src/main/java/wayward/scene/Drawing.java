package wayward.scene;

/** Pixel work on a w × h grey canvas: textures placed with sub-pixel accuracy, the picture shifted or blurred. */
final class Drawing {
    private Drawing() {
    }

    /** Draws a texture centred at (cx, cy) pixels with sub-pixel placement (bilinear sampling). */
    static void draw(float[] canvas, int w, int h, float[] tex, int tw, int th, double cx, double cy) {
        double left = cx - tw / 2.0;
        double top = cy - th / 2.0;
        int xa = Math.max(0, (int) Math.floor(left));
        int xb = Math.min(w - 1, (int) Math.ceil(left + tw - 1));
        int ya = Math.max(0, (int) Math.floor(top));
        int yb = Math.min(h - 1, (int) Math.ceil(top + th - 1));
        for (int y = ya; y <= yb; y++) {
            double ty = y - top;
            if (ty < 0 || ty > th - 1) {
                continue;
            }
            int ty0 = Math.min((int) ty, th - 2);
            double fy = ty - ty0;
            for (int x = xa; x <= xb; x++) {
                double tx = x - left;
                if (tx < 0 || tx > tw - 1) {
                    continue;
                }
                int tx0 = Math.min((int) tx, tw - 2);
                double fx = tx - tx0;
                int i = ty0 * tw + tx0;
                double a = tex[i] + fx * (tex[i + 1] - tex[i]);
                double b = tex[i + tw] + fx * (tex[i + tw + 1] - tex[i + tw]);
                canvas[y * w + x] = (float) (a + fy * (b - a));
            }
        }
    }

    /**
     * Draws a tw × th texture scaled to outW × outH px centred at (cx, cy), as a camera would see it: each pixel
     * is the texture's mean over the pixel's footprint, blended with what lies behind by the share of the pixel
     * the box covers (so an edge moving less than a pixel per frame still moves in the picture).
     */
    static void drawSoft(float[] canvas, int w, int h, float[] tex, int tw, int th, double cx, double cy,
            double outW, double outH) {
        double left = cx - outW / 2;
        double top = cy - outH / 2;
        double sx = tw / outW; // texture px per picture px
        double sy = th / outH;
        int nx = Math.max(1, (int) Math.ceil(sx));
        int ny = Math.max(1, (int) Math.ceil(sy));
        int xa = Math.max(0, (int) Math.floor(left));
        int xb = Math.min(w - 1, (int) Math.ceil(left + outW));
        int ya = Math.max(0, (int) Math.floor(top));
        int yb = Math.min(h - 1, (int) Math.ceil(top + outH));
        for (int y = ya; y <= yb; y++) {
            // picture pixel y covers [y - 0.5, y + 0.5] (pixel centres on integers, as in draw)
            double coverY = Math.min(y + 0.5, top + outH - 0.5) - Math.max(y - 0.5, top - 0.5);
            if (coverY <= 0) {
                continue;
            }
            coverY = Math.min(1, coverY);
            for (int x = xa; x <= xb; x++) {
                double coverX = Math.min(x + 0.5, left + outW - 0.5) - Math.max(x - 0.5, left - 0.5);
                if (coverX <= 0) {
                    continue;
                }
                coverX = Math.min(1, coverX);
                double sum = 0;
                for (int j = 0; j < ny; j++) {
                    double ty = (y - top + 0.5 + (j + 0.5) / ny - 0.5) * sy - 0.5;
                    for (int i = 0; i < nx; i++) {
                        double tx = (x - left + 0.5 + (i + 0.5) / nx - 0.5) * sx - 0.5;
                        sum += texel(tex, tw, th, tx, ty);
                    }
                }
                double v = sum / (nx * ny);
                double cover = coverX * coverY;
                int p = y * w + x;
                canvas[p] = (float) (canvas[p] + cover * (v - canvas[p]));
            }
        }
    }

    /** Bilinear texture sample at (tx, ty), texel centres on integers, edges repeated. */
    private static double texel(float[] tex, int tw, int th, double tx, double ty) {
        double x = Math.max(0, Math.min(tw - 1.0, tx));
        double y = Math.max(0, Math.min(th - 1.0, ty));
        int x0 = Math.min((int) x, Math.max(0, tw - 2));
        int y0 = Math.min((int) y, Math.max(0, th - 2));
        double fx = x - x0;
        double fy = y - y0;
        int i = y0 * tw + x0;
        int dx = tw > 1 ? 1 : 0;
        int dy = th > 1 ? tw : 0;
        double a = tex[i] + fx * (tex[i + dx] - tex[i]);
        double b = tex[i + dy] + fx * (tex[i + dy + dx] - tex[i + dy]);
        return a + fy * (b - a);
    }

    /** The background seen by a camera moved by (ox, oy) pixels: bilinear, edges repeated. */
    static void shift(float[] src, float[] dst, int w, int h, double ox, double oy) {
        for (int y = 0; y < h; y++) {
            double sy = Math.max(0, Math.min(h - 1.001, y + oy));
            int y0 = (int) sy;
            double fy = sy - y0;
            for (int x = 0; x < w; x++) {
                double sx = Math.max(0, Math.min(w - 1.001, x + ox));
                int x0 = (int) sx;
                double fx = sx - x0;
                int i = y0 * w + x0;
                double a = src[i] + fx * (src[i + 1] - src[i]);
                double b = src[i + w] + fx * (src[i + w + 1] - src[i + w]);
                dst[y * w + x] = (float) (a + fy * (b - a));
            }
        }
    }

    /** Box blur of radius r, rows then columns, through {@code tmp}. */
    static void blur(float[] img, float[] tmp, int w, int h, int r) {
        boxMeans(img, tmp, h, w, w, 1, r);
        boxMeans(tmp, img, w, h, 1, w, r);
    }

    /**
     * Means over 2r + 1 neighbours (fewer at the ends) along {@code lines} lines of {@code length} samples each:
     * sample i of line j is at j · lineStep + i · step.
     */
    private static void boxMeans(float[] src, float[] dst, int lines, int length, int lineStep, int step, int r) {
        for (int j = 0; j < lines; j++) {
            for (int i = 0; i < length; i++) {
                double sum = 0;
                int n = 0;
                for (int k = Math.max(0, i - r); k <= Math.min(length - 1, i + r); k++) {
                    sum += src[j * lineStep + k * step];
                    n++;
                }
                dst[j * lineStep + i * step] = (float) (sum / n);
            }
        }
    }
}
