package wayward.flow;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.HashMap;
import java.util.Locale;
import java.util.Map;
import java.util.SplittableRandom;

/**
 * One case of the object-motion benchmark ({@link ObjectMotionBench}): a still background of
 * {@link #WIDTH}×{@link #HEIGHT} pixels with one square object of {@code sizePx} pixels pasted on it in the first
 * frame and moved by exactly {@code (dx, dy)} pixels in the second.
 *
 * <p>Rendering (analytic truth, no resampling of rendered frames): pixel (x, y) covers the unit square
 * [x − ½, x + ½] × [y − ½, y + ½]. The object occupies the square [ox, ox + s) × [oy, oy + s) in the first frame
 * (ox, oy real, with a random sub-pixel part) and the same square moved by (dx, dy) in the second. A pixel's value
 * is {@code (1 − a) · background + ∫ texture} over the part of the pixel the object covers, where {@code a} is
 * that part's area (exact: both squares are axis-aligned). Plain paint and the rim are integrated exactly; photo
 * patches (Catmull-Rom bicubic through {@link ImageTexture}) and procedural textures ({@link Textures}) by a 4×4
 * midpoint rule over the covered part. The texture is defined in the object's own coordinates, so both frames
 * sample the same continuous object; nothing goes through cv::warpAffine (FLOW-NOTES: it rounds positions to
 * 1/32 px). Gaussian sensor noise, independent per frame, is added last, then values are rounded to 8 bits.
 *
 * <p>Truth: the object's displacement (dx, dy) at every pixel whose centre lies inside the first frame's object
 * square ({@link Frames#object}), 0 elsewhere. The ring ({@link Frames#ring}) holds the still background around
 * it: pixels whose centre is within {@link #RING_PX} (Euclidean) of the first frame's square and which the object
 * touches in neither frame (mixed edge pixels, uncovered and newly occluded pixels are left out).
 *
 * @param half          which half of the benchmark the case belongs to
 * @param index         position of the case in its half's list
 * @param background    photo or plain grey
 * @param backgroundPhoto file under {@link ImageTexture#DATA} for a photo background, null for plain
 * @param sizePx        side of the object's square, pixels
 * @param texture       what the object is painted with
 * @param texturePhoto  file under {@link ImageTexture#DATA} for a photo texture, null otherwise
 * @param motionPx      length of the object's displacement, pixels per frame pair
 * @param angleDeg      direction of the displacement in image axes (0 = +x, 90 = +y i.e. down the picture)
 * @param noiseSigma    standard deviation of the sensor noise, grey levels (0 = none)
 * @param seed          drives every random choice (crop, position, paint, noise)
 */
record ObjectMotionCase(ObjectMotionBench.Half half, int index, BackgroundKind background, String backgroundPhoto,
        int sizePx, TextureKind texture, String texturePhoto, double motionPx, double angleDeg, double noiseSigma,
        long seed) {
    /**
     * The benchmark's scale ({@code -Dbench.scale=K}, default 1): the same scenes filmed at K times the resolution.
     * The picture, the objects, their motions, rims, procedural wavelengths, the margin and the ring are all K
     * times as many pixels, and the photographs are sampled K times as finely (natively where the file has the
     * pixels, by its bicubic model where it has not). A flow method whose reaches are fixed in pixels loses there.
     */
    static final int SCALE = scale("bench.scale", System.getProperty("bench.scale", "1"));
    /**
     * The movers' scale ({@code -Dbench.movers=K}, default {@link #SCALE}): their sides, motions, rims, procedural
     * wavelengths and the ring around them. {@code -Dbench.scale=2 -Dbench.movers=1} films the scene at twice the
     * resolution with movers of the benchmark's sizes in pixels: movers twice as far away.
     */
    static final int MOVER_SCALE = scale("bench.movers", System.getProperty("bench.movers", Integer.toString(SCALE)));
    /**
     * The scored picture's shrink ({@code -Dbench.shrink=K}, default 1): each case is rendered as above and then
     * averaged over K × K blocks, as a camera of 1/K the resolution sees it ({@link Frames#shrunk}).
     * {@code -Dbench.shrink=2} scores the benchmark's scenes at 160×120: movers of 4 to 24 px moving 0.25 to 4 px,
     * in noise of half the σ.
     */
    static final int SHRINK = scale("bench.shrink", System.getProperty("bench.shrink", "1"));
    /** Picture size at scale 1, pixels. */
    static final int BASE_WIDTH = 320;
    static final int BASE_HEIGHT = 240;
    /** Picture size, pixels. */
    static final int WIDTH = BASE_WIDTH * SCALE;
    static final int HEIGHT = BASE_HEIGHT * SCALE;
    /** Width of the ring of still background scored around the object, pixels. */
    static final double RING_PX = 7 * MOVER_SCALE;
    /** Smallest distance of the first frame's object from the picture border, pixels. */
    private static final int MARGIN_PX = 24 * SCALE;
    /** Midpoint-rule points per axis when integrating a smooth texture over one pixel's covered part. */
    private static final int QUADRATURE = 4;
    /** Plain grey background levels are drawn from [base, base + span). */
    private static final int PLAIN_BACKGROUND_BASE = 90;
    private static final int PLAIN_BACKGROUND_SPAN = 80;
    /** Contrast of plain paint against the background under it, grey levels: [min, min + span). */
    private static final double PAINT_CONTRAST_MIN = 35;
    private static final double PAINT_CONTRAST_SPAN = 50;
    /** How much darker the rim is than the paint, grey levels; the rim is 1 to 2 px wide. */
    private static final double RIM_DARKER = 45;
    /** Photo patches tried for contrast; the one with the largest standard deviation wins unless one passes. */
    private static final int PATCH_TRIES = 24;
    private static final double PATCH_MIN_STD = 20;
    /**
     * Procedural textures: {@link Textures} (wavelengths 6 to 40 px) squeezed by this factor: 3 to 20 px (M times
     * that at the movers' scale M).
     */
    private static final double PROCEDURAL_SQUEEZE = 2.0 / MOVER_SCALE;

    /** What the background is. */
    enum BackgroundKind {
        PHOTO("photo"), PLAIN("plain");

        final String label;

        BackgroundKind(String label) {
            this.label = label;
        }
    }

    /** What the object is painted with. */
    enum TextureKind {
        /** A patch of a real photograph (other photographs than the backgrounds). */
        PHOTO("photo"),
        /** Smooth procedural texture: a sum of sinusoids, wavelengths 3 to 20 px. */
        PROCEDURAL("procedural"),
        /** One flat grey level. */
        PLAIN("plain"),
        /** Flat grey with a darker rim 1 to 2 px wide along its edge, like a van's roof seen from above. */
        RIM("plain+rim");

        final String label;

        TextureKind(String label) {
            this.label = label;
        }
    }

    /**
     * A rendered case. Arrays are row-major {@link #WIDTH} × {@link #HEIGHT}, freshly allocated and owned by the
     * caller.
     *
     * @param first  first frame, gray 8-bit
     * @param second second frame, gray 8-bit
     * @param object pixels of the object in the first frame (centre inside its square): truth (dx, dy)
     * @param ring   still background around the object: truth (0, 0)
     * @param dx     true horizontal displacement of the object, pixels
     * @param dy     true vertical displacement, pixels (positive = down)
     */
    record Frames(byte[] first, byte[] second, boolean[] object, boolean[] ring, double dx, double dy) {
        /**
         * These frames averaged over k × k blocks (rounded to the nearest grey level): {@link #WIDTH} / k ×
         * {@link #HEIGHT} / k. A shrunk pixel is the object's (or the ring's) where all its k × k pixels are; the
         * motion is 1/k as many pixels. k = 1 gives these frames.
         */
        Frames shrunk(int k) {
            if (k == 1) {
                return this;
            }
            final int w = WIDTH / k;
            final int h = HEIGHT / k;
            byte[] a = new byte[w * h];
            byte[] b = new byte[w * h];
            boolean[] o = new boolean[w * h];
            boolean[] r = new boolean[w * h];
            for (int y = 0; y < h; y++) {
                for (int x = 0; x < w; x++) {
                    int sa = 0;
                    int sb = 0;
                    boolean allObject = true;
                    boolean allRing = true;
                    for (int dy = 0; dy < k; dy++) {
                        for (int dx = 0; dx < k; dx++) {
                            int i = (y * k + dy) * WIDTH + x * k + dx;
                            sa += first[i] & 0xff;
                            sb += second[i] & 0xff;
                            allObject &= object[i];
                            allRing &= ring[i];
                        }
                    }
                    int j = y * w + x;
                    a[j] = (byte) ((sa + k * k / 2) / (k * k));
                    b[j] = (byte) ((sb + k * k / 2) / (k * k));
                    o[j] = allObject;
                    r[j] = allRing;
                }
            }
            return new Frames(a, b, o, r, dx / k, dy / k);
        }
    }

    /** The object's texture in its own coordinates (u, v) ∈ [0, s)², grey levels. */
    private interface ObjectTexture {
        /** Integral of the texture over the rectangle [u0, u1] × [v0, v1] (grey levels × pixels²). */
        double integral(double u0, double u1, double v0, double v1);
    }

    private static final Map<String, Photo> PHOTOS = new HashMap<>();

    /**
     * A photograph as the cases sample it: pixel (x, y) of a case is the loaded picture's (x, y) × {@code step}
     * (1 where the file was shrunk to the case's scale by an integer factor; under 1 where it has too few pixels
     * for the scale and its bicubic model fills in).
     */
    record Photo(ImageTexture texture, double step) {
        double at(double x, double y) {
            return texture.at(x * step, y * step);
        }

        int width() {
            return (int) (texture.width() / step);
        }

        int height() {
            return (int) (texture.height() / step);
        }
    }

    private static int scale(String key, String value) {
        try {
            int k = Integer.parseInt(value.trim());
            if (k >= 1 && k <= 4) {
                return k;
            }
        } catch (NumberFormatException e) {
            // reported below
        }
        throw new IllegalArgumentException(key + ": " + value + " (expected a whole number from 1 to 4)");
    }

    /** This case at k times the resolution: the object's side and its motion k times as many pixels. */
    ObjectMotionCase scaled(int k) {
        return k == 1 ? this : new ObjectMotionCase(half, index, background, backgroundPhoto, sizePx * k, texture,
                texturePhoto, motionPx * k, angleDeg, noiseSigma, seed);
    }

    /** True displacement, pixels. */
    double dx() {
        return motionPx * Math.cos(Math.toRadians(angleDeg));
    }

    double dy() {
        return motionPx * Math.sin(Math.toRadians(angleDeg));
    }

    /** Short description for tables and failure messages. */
    String label() {
        return String.format(Locale.ROOT, "%s#%d %s %dpx %s %.1fpx@%.0fdeg noise %.1f", half.label, index,
                background == BackgroundKind.PHOTO ? backgroundPhoto : "plain", sizePx,
                texture == TextureKind.PHOTO ? "photo " + texturePhoto : texture.label, motionPx, angleDeg, noiseSigma);
    }

    /** Renders both frames and the masks; deterministic for a given case. Allocates about 2 MB. */
    Frames render() {
        SplittableRandom r = new SplittableRandom(seed);
        Exact e = renderExact(r);
        SplittableRandom noise1 = r.split();
        SplittableRandom noise2 = r.split();
        boolean[] object = new boolean[WIDTH * HEIGHT];
        boolean[] ring = new boolean[WIDTH * HEIGHT];
        for (int y = 0; y < HEIGHT; y++) {
            for (int x = 0; x < WIDTH; x++) {
                int i = y * WIDTH + x;
                object[i] = x >= e.ox && x < e.ox + sizePx && y >= e.oy && y < e.oy + sizePx;
                // distance from the pixel centre to the first frame's square (0 inside)
                double ex = Math.max(0, Math.max(e.ox - x, x - (e.ox + sizePx)));
                double ey = Math.max(0, Math.max(e.oy - y, y - (e.oy + sizePx)));
                ring[i] = e.cover1[i] == 0 && e.cover2[i] == 0 && Math.hypot(ex, ey) <= RING_PX;
            }
        }
        return new Frames(quantise(e.first, noise1), quantise(e.second, noise2), object, ring, dx(), dy());
    }

    /**
     * The frames before noise and rounding, with the background and the top-left corner of the first frame's
     * object (for checks of the rendering itself). Arrays are fresh and owned by the caller.
     */
    Exact renderExact() {
        return renderExact(new SplittableRandom(seed));
    }

    /**
     * Frames before noise and rounding (grey levels, row-major), the still background, the area each pixel's
     * object part covers in either frame (0 to 1) and the object's top-left corner in the first frame (px).
     */
    record Exact(double[] first, double[] second, double[] background, double[] cover1, double[] cover2, double ox,
            double oy) {
    }

    private Exact renderExact(SplittableRandom r) {
        double[] bg = backgroundPixels(r);
        int span = WIDTH - 2 * MARGIN_PX - sizePx;
        int spanY = HEIGHT - 2 * MARGIN_PX - sizePx;
        double ox = MARGIN_PX + r.nextInt(span) + r.nextDouble();
        double oy = MARGIN_PX + r.nextInt(spanY) + r.nextDouble();
        ObjectTexture tex = objectTexture(r, bg, ox, oy);
        double[] a = bg.clone();
        double[] b = bg.clone();
        double[] cover1 = paste(a, bg, tex, ox, oy);
        double[] cover2 = paste(b, bg, tex, ox + dx(), oy + dy());
        return new Exact(a, b, bg, cover1, cover2, ox, oy);
    }

    private double[] backgroundPixels(SplittableRandom r) {
        double[] bg = new double[WIDTH * HEIGHT];
        if (background == BackgroundKind.PLAIN) {
            java.util.Arrays.fill(bg, PLAIN_BACKGROUND_BASE + r.nextInt(PLAIN_BACKGROUND_SPAN));
            return bg;
        }
        Photo photo = photo(backgroundPhoto, true);
        int cx = r.nextInt(photo.width() - WIDTH + 1);
        int cy = r.nextInt(photo.height() - HEIGHT + 1);
        for (int y = 0; y < HEIGHT; y++) {
            for (int x = 0; x < WIDTH; x++) {
                // Catmull-Rom at integer positions returns the stored pixel itself
                bg[y * WIDTH + x] = photo.at(x + cx, y + cy);
            }
        }
        return bg;
    }

    private ObjectTexture objectTexture(SplittableRandom r, double[] bg, double ox, double oy) {
        final int s = sizePx;
        switch (texture) {
            case PHOTO: {
                Photo photo = photo(texturePhoto, false);
                double bestStd = -1;
                int bestX = 0;
                int bestY = 0;
                for (int t = 0; t < PATCH_TRIES && bestStd < PATCH_MIN_STD; t++) {
                    int px = r.nextInt(photo.width() - s - 4) + 2;
                    int py = r.nextInt(photo.height() - s - 4) + 2;
                    double std = patchStd(photo, px, py, s);
                    if (std > bestStd) {
                        bestStd = std;
                        bestX = px;
                        bestY = py;
                    }
                }
                final int px = bestX;
                final int py = bestY;
                return midpoint((u, v) -> photo.at(px + u, py + v));
            }
            case PROCEDURAL: {
                Textures t = new Textures(r.nextLong(), 12);
                return midpoint((u, v) -> t.at(PROCEDURAL_SQUEEZE * u, PROCEDURAL_SQUEEZE * v));
            }
            case PLAIN: {
                double paint = paint(r, bg, ox, oy, 0);
                return (u0, u1, v0, v1) -> paint * (u1 - u0) * (v1 - v0);
            }
            case RIM: {
                double paint = paint(r, bg, ox, oy, RIM_DARKER);
                double rimLevel = paint - RIM_DARKER;
                double rim = (1 + r.nextDouble()) * MOVER_SCALE;
                double inner0 = rim;
                double inner1 = s - rim;
                return (u0, u1, v0, v1) -> {
                    double all = (u1 - u0) * (v1 - v0);
                    double iu = Math.max(0, Math.min(u1, inner1) - Math.max(u0, inner0));
                    double iv = Math.max(0, Math.min(v1, inner1) - Math.max(v0, inner0));
                    double inner = iu * iv;
                    return paint * inner + rimLevel * (all - inner);
                };
            }
            default:
                throw new IllegalStateException("texture kind: " + texture);
        }
    }

    /**
     * A plain paint level contrasting with the background under the object by 35 to 85 grey levels, lighter or
     * darker at random, kept within [10 + floor, 245].
     */
    private double paint(SplittableRandom r, double[] bg, double ox, double oy, double floor) {
        double sum = 0;
        int n = 0;
        for (int y = (int) oy; y < oy + sizePx; y++) {
            for (int x = (int) ox; x < ox + sizePx; x++) {
                sum += bg[y * WIDTH + x];
                n++;
            }
        }
        double under = sum / n;
        double contrast = PAINT_CONTRAST_MIN + PAINT_CONTRAST_SPAN * r.nextDouble();
        double paint = r.nextBoolean() ? under + contrast : under - contrast;
        if (paint > 245 || paint < 10 + floor) {
            paint = paint > under ? under - contrast : under + contrast;
        }
        return Math.max(10 + floor, Math.min(245, paint));
    }

    private static double patchStd(Photo photo, int px, int py, int s) {
        double sum = 0;
        double sum2 = 0;
        for (int y = 0; y < s; y++) {
            for (int x = 0; x < s; x++) {
                double v = photo.at(px + x, py + y);
                sum += v;
                sum2 += v * v;
            }
        }
        double n = (double) s * s;
        double mean = sum / n;
        return Math.sqrt(Math.max(0, sum2 / n - mean * mean));
    }

    /** Integral of a smooth texture by the midpoint rule on a 4×4 grid over the rectangle. */
    private static ObjectTexture midpoint(java.util.function.DoubleBinaryOperator f) {
        return (u0, u1, v0, v1) -> {
            double du = (u1 - u0) / QUADRATURE;
            double dv = (v1 - v0) / QUADRATURE;
            double sum = 0;
            for (int j = 0; j < QUADRATURE; j++) {
                double v = v0 + (j + 0.5) * dv;
                for (int i = 0; i < QUADRATURE; i++) {
                    sum += f.applyAsDouble(u0 + (i + 0.5) * du, v);
                }
            }
            return sum * du * dv;
        };
    }

    /**
     * Pastes the object with its top-left corner at (ox, oy) into {@code frame} (which holds the background) and
     * returns the area of each pixel the object covers (0 to 1).
     */
    private double[] paste(double[] frame, double[] bg, ObjectTexture tex, double ox, double oy) {
        double[] cover = new double[WIDTH * HEIGHT];
        int x0 = Math.max(0, (int) Math.floor(ox - 0.5));
        int x1 = Math.min(WIDTH - 1, (int) Math.ceil(ox + sizePx + 0.5));
        int y0 = Math.max(0, (int) Math.floor(oy - 0.5));
        int y1 = Math.min(HEIGHT - 1, (int) Math.ceil(oy + sizePx + 0.5));
        for (int y = y0; y <= y1; y++) {
            double b0 = Math.max(y - 0.5, oy);
            double b1 = Math.min(y + 0.5, oy + sizePx);
            if (b1 <= b0) {
                continue;
            }
            for (int x = x0; x <= x1; x++) {
                double a0 = Math.max(x - 0.5, ox);
                double a1 = Math.min(x + 0.5, ox + sizePx);
                if (a1 <= a0) {
                    continue;
                }
                int i = y * WIDTH + x;
                double area = (a1 - a0) * (b1 - b0);
                cover[i] = area;
                frame[i] = (1 - area) * bg[i] + tex.integral(a0 - ox, a1 - ox, b0 - oy, b1 - oy);
            }
        }
        return cover;
    }

    /** Adds Gaussian noise of σ {@link #noiseSigma} (Box–Muller) and rounds to 8 bits. */
    private byte[] quantise(double[] frame, SplittableRandom r) {
        byte[] out = new byte[frame.length];
        for (int i = 0; i < frame.length; i++) {
            double v = frame[i];
            if (noiseSigma > 0) {
                v += noiseSigma * Math.sqrt(-2 * Math.log(1 - r.nextDouble())) * Math.cos(2 * Math.PI * r.nextDouble());
            }
            out[i] = (byte) Math.max(0, Math.min(255, Math.round(v)));
        }
        return out;
    }

    /**
     * A photograph from Debian's opencv-doc package, loaded once. At scale 1 it is shrunk by the largest integer
     * factor f that keeps at least 320×240 (object textures alike, so a patch shows about as much of its scene as
     * the background does); at scale K by f / K where that is a whole number, and otherwise it is kept whole and
     * sampled every f / K of its pixels, so every scale shows the same part of the scene.
     *
     * @throws IllegalStateException naming the package when the file is missing
     */
    static synchronized Photo photo(String name, boolean asBackground) {
        Photo t = PHOTOS.get(name);
        if (t != null) {
            return t;
        }
        Path file = ImageTexture.DATA.resolve(name);
        if (!Files.isRegularFile(file)) {
            throw new IllegalStateException(file + ": missing; the object-motion benchmark needs the photographs of"
                    + " Debian's opencv-doc package (apt-get install opencv-doc)");
        }
        try {
            ImageTexture full = ImageTexture.load(file, 1);
            int shrink = Math.max(1, Math.min(full.width() / BASE_WIDTH, full.height() / BASE_HEIGHT));
            if (shrink % SCALE == 0) {
                int k = shrink / SCALE;
                t = new Photo(k == 1 ? full : ImageTexture.load(file, k), 1);
            } else {
                t = new Photo(full, (double) shrink / SCALE);
            }
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        if (asBackground && (t.width() < WIDTH || t.height() < HEIGHT)) {
            throw new IllegalStateException(file + ": " + t.width() + "x" + t.height() + " (expected at least "
                    + WIDTH + "x" + HEIGHT + " for a background)");
        }
        PHOTOS.put(name, t);
        return t;
    }
}
