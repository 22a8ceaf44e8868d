package wayward.zone;

/**
 * Tells light from movers, for {@link MoverTracker}: whether the change of the picture under one group of moving
 * samples is a change of brightness over ground that stays put (a headlight beam or a reflection sweeping over the
 * ground) rather than texture carried along by a mover. Light changes brightness, not texture: where a beam lies,
 * the second frame is the first with zero motion after a local gain and offset (I1 ≈ a·I0 + b, the offset varying
 * slowly over the beam), while a mover replaces the texture under it with its own, displaced by its motion.
 *
 * <p>The test works on the discrete Laplacian of both frames (4-neighbour, a common second-difference high-pass):
 * it removes the offset and its slow slope across the window, and a gain scales it. Over the pixels the group's
 * samples stand for, it correlates the second frame's Laplacian with the first's at zero motion (the camera's
 * motion only, when that is removed) and at the group's own motion (rounded to whole pixels). The change is light
 * when the zero-motion correlation reaches {@link #MIN_STILL_CORRELATION} and beats the moved one by
 * {@link #MIN_CORRELATION_GAIN}. The first condition is the guard for plain ground: sensor noise is independent
 * between frames, so a high correlation at zero motion needs texture that stayed where it was; a plain mover over
 * plain ground correlates at neither and stays a mover. The second is the guard for real movers over texture: the
 * texture they carry correlates better where they moved it. Pixels clipped in either frame (a saturated beam's
 * core, black night) carry no texture and are left out. Groups moving less than {@link #MIN_SHIFT_PX} per frame
 * pair are never judged (a crawl's half-pixel step cannot be told from no step by whole-pixel shifts).
 *
 * <p>One instance per tracker, called on the analysis thread; allocates nothing.
 */
final class Relighting {
    /** Zero-motion correlation of the Laplacians from which texture stayed put (Pearson-like, 0 to 1). */
    static final double MIN_STILL_CORRELATION = 0.5;
    /** By how much zero motion must explain the group better than its own motion. */
    static final double MIN_CORRELATION_GAIN = 0.2;
    /** Smallest motion of a group, px per frame pair, that whole-pixel shifts can tell from none. */
    static final double MIN_SHIFT_PX = 1.5;
    /** Grey levels at or beyond which a pixel is clipped (carries no texture). */
    static final int DARK_CLIP = 4;
    static final int BRIGHT_CLIP = 251;
    /** Fewest unclipped pixels for a judgement. */
    static final int MIN_PIXELS = 32;

    private final MoverGroups gr;
    private final int imageWidth;
    private final int imageHeight;
    /** Correlations of the last {@link #isLight} call, for tests and reports. */
    double stillCorrelation;
    boolean dumped = true;
    double movedCorrelation;

    Relighting(MoverGroups groups, int imageWidth, int imageHeight) {
        this.gr = groups;
        this.imageWidth = imageWidth;
        this.imageHeight = imageHeight;
    }

    /**
     * True when group g's change from {@code first} to {@code second} is light over ground that stays put.
     *
     * @param first   the earlier frame, imageWidth × imageHeight grey levels, row-major; read only
     * @param second  the later frame, same layout; read only
     * @param camU    the camera's motion between them, px (0 when it is not removed)
     */
    boolean isLight(int g, byte[] first, byte[] second, float camU, float camV) {
        stillCorrelation = Double.NaN;
        if (Boolean.getBoolean("wayward.debugLight") && !dumped) {
            try {
                java.nio.file.Files.write(java.nio.file.Path.of("/tmp/b/f0-" + gr.vu[g] + ".raw"), first);
                java.nio.file.Files.write(java.nio.file.Path.of("/tmp/b/f1-" + gr.vu[g] + ".raw"), second);
            } catch (java.io.IOException e) {
                throw new java.io.UncheckedIOException(e);
            }
        }
        movedCorrelation = Double.NaN;
        final double gu = gr.vu[g];
        final double gv = gr.vv[g];
        if (Math.sqrt(gu * gu + gv * gv) < MIN_SHIFT_PX) {
            return false;
        }
        final int sx = Math.round(camU);
        final int sy = Math.round(camV);
        final int mx = (int) Math.round(gu + camU);
        final int my = (int) Math.round(gv + camV);
        final int w = imageWidth;
        final int h = imageHeight;
        final int s = gr.stride;
        final int margin = 1 + Math.max(Math.max(Math.abs(sx), Math.abs(sy)), Math.max(Math.abs(mx), Math.abs(my)));
        double s11 = 0;
        double s00 = 0;
        double s01 = 0;
        double smm = 0;
        double sm1 = 0;
        int n = 0;
        final int gw = gr.gridWidth;
        for (int j = gr.minJ[g]; j <= gr.maxJ[g]; j++) {
            for (int i = gr.minI[g]; i <= gr.maxI[g]; i++) {
                final int k = j * gw + i;
                if (gr.labelOf(k) != g) {
                    continue;
                }
                final int x0 = Math.max(margin, i * s);
                final int x1 = Math.min(w - margin, i * s + s);
                final int y0 = Math.max(margin, j * s);
                final int y1 = Math.min(h - margin, j * s + s);
                for (int y = y0; y < y1; y++) {
                    for (int x = x0; x < x1; x++) {
                        final int p = y * w + x;
                        final int ps = p - sy * w - sx;
                        final int pm = p - my * w - mx;
                        if (clipped(second, p, w) || clipped(first, ps, w) || clipped(first, pm, w)) {
                            continue;
                        }
                        final double l1 = laplacian(second, p, w);
                        final double l0 = laplacian(first, ps, w);
                        final double lm = laplacian(first, pm, w);
                        s11 += l1 * l1;
                        s00 += l0 * l0;
                        s01 += l0 * l1;
                        smm += lm * lm;
                        sm1 += lm * l1;
                        n++;
                    }
                }
            }
        }
        if (n < MIN_PIXELS || !(s11 > 0) || !(s00 > 0) || !(smm > 0)) {
            return false;
        }
        final double still = s01 / Math.sqrt(s00 * s11);
        final double moved = sm1 / Math.sqrt(smm * s11);
        stillCorrelation = still;
        movedCorrelation = moved;
        return still >= MIN_STILL_CORRELATION && still - moved >= MIN_CORRELATION_GAIN;
    }

    /** Fine (within a sample's block) and coarse (block against its 3 × 3 blocks) energy of the change, per pixel. */
    double fineEnergy;
    double coarseEnergy;

    void smoothness(int g, byte[] first, byte[] second, float camU, float camV) {
        final int sx = Math.round(camU);
        final int sy = Math.round(camV);
        final int w = imageWidth;
        final int s = gr.stride;
        final int gw = gr.gridWidth;
        final int gh = gr.gridHeight;
        double fine = 0;
        double coarse = 0;
        int n = 0;
        for (int j = Math.max(1, gr.minJ[g]); j <= Math.min(gh - 2, gr.maxJ[g]); j++) {
            for (int i = Math.max(1, gr.minI[g]); i <= Math.min(gw - 2, gr.maxI[g]); i++) {
                if (gr.labelOf(j * gw + i) != g || (i + 1) * s + 1 + Math.abs(sx) >= w || (j + 1) * s + 1 + Math.abs(sy) >= imageHeight
                        || (i - 1) * s - Math.abs(sx) < 0 || (j - 1) * s - Math.abs(sy) < 0) {
                    continue;
                }
                double centre = 0;
                double ring = 0;
                for (int bj = -1; bj <= 1; bj++) {
                    for (int bi = -1; bi <= 1; bi++) {
                        double m = 0;
                        for (int y = (j + bj) * s; y < (j + bj + 1) * s; y++) {
                            for (int x = (i + bi) * s; x < (i + bi + 1) * s; x++) {
                                final int p = y * w + x;
                                m += grey(second, p) - grey(first, p - sy * w - sx);
                            }
                        }
                        m /= s * s;
                        ring += m;
                        if (bi == 0 && bj == 0) {
                            centre = m;
                        }
                    }
                }
                for (int y = j * s; y < (j + 1) * s; y++) {
                    for (int x = i * s; x < (i + 1) * s; x++) {
                        final int p = y * w + x;
                        final double d = grey(second, p) - grey(first, p - sy * w - sx) - centre;
                        fine += d * d;
                    }
                }
                final double c = centre - ring / 9;
                coarse += c * c * s * s;
                n += s * s;
            }
        }
        fineEnergy = n > 0 ? fine / n : Double.NaN;
        coarseEnergy = n > 0 ? coarse / n : Double.NaN;
    }

    double rangeGrey;
    double edgeGradient;

    /** Edge width: the group's grey range over its blocks against the mean of its blocks' steepest 3 × 3-smoothed gradient. */
    double edgeWidth(int g, byte[] second) {
        final int w = imageWidth;
        final int s = gr.stride;
        final int gw = gr.gridWidth;
        final int gh = gr.gridHeight;
        double lo = Double.POSITIVE_INFINITY;
        double hi = Double.NEGATIVE_INFINITY;
        double sumMax = 0;
        int blocks = 0;
        for (int j = Math.max(1, gr.minJ[g]); j <= Math.min(gh - 2, gr.maxJ[g]); j++) {
            for (int i = Math.max(1, gr.minI[g]); i <= Math.min(gw - 2, gr.maxI[g]); i++) {
                if (gr.labelOf(j * gw + i) != g || (i + 1) * s + 2 >= w || (j + 1) * s + 2 >= imageHeight) {
                    continue;
                }
                double best = 0;
                for (int y = j * s; y < (j + 1) * s; y++) {
                    for (int x = i * s; x < (i + 1) * s; x++) {
                        final double c = smooth(second, y * w + x, w);
                        lo = Math.min(lo, c);
                        hi = Math.max(hi, c);
                        final double gx = 0.5 * (smooth(second, y * w + x + 1, w) - smooth(second, y * w + x - 1, w));
                        final double gy = 0.5 * (smooth(second, y * w + x + w, w) - smooth(second, y * w + x - w, w));
                        best = Math.max(best, Math.sqrt(gx * gx + gy * gy));
                    }
                }
                sumMax += best;
                blocks++;
            }
        }
        rangeGrey = hi - lo;
        edgeGradient = blocks > 0 ? sumMax / blocks : Double.NaN;
        return rangeGrey / edgeGradient;
    }

    private static double smooth(byte[] f, int p, int w) {
        int sum = 0;
        for (int d = -w; d <= w; d += w) {
            sum += grey(f, p + d - 1) + grey(f, p + d) + grey(f, p + d + 1);
        }
        return sum / 9.0;
    }

    private static int grey(byte[] f, int p) {
        return f[p] & 0xff;
    }

    private static boolean clipped(byte[] f, int p, int w) {
        return out(grey(f, p)) || out(grey(f, p - 1)) || out(grey(f, p + 1)) || out(grey(f, p - w)) || out(grey(f, p + w));
    }

    private static boolean out(int grey) {
        return grey <= DARK_CLIP || grey >= BRIGHT_CLIP;
    }

    private static double laplacian(byte[] f, int p, int w) {
        return 4 * grey(f, p) - grey(f, p - 1) - grey(f, p + 1) - grey(f, p - w) - grey(f, p + w);
    }
}
