package wayward.scene;

import static org.bytedeco.ffmpeg.global.avutil.AV_PIX_FMT_GRAY8;
import static org.bytedeco.ffmpeg.global.avutil.AV_PIX_FMT_YUV420P;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import org.bytedeco.javacv.FFmpegFrameRecorder;
import org.bytedeco.javacv.Frame;

/**
 * Renders a scenario video with exact ground truth: a textured background (generated, or a real photograph),
 * movers (generated texture, plain with a rim, or a patch of a photograph) on straight scripted paths at set
 * times and sizes, nuisances (light changes and flicker, headlight glare, shake, rain, foliage, shadow,
 * tampering) and Gaussian sensor noise; writes an H.264 MP4 (the FFmpeg build's libopenh264 encoder)
 * and a JSON file saying, per mover, its path, its bearing and when its centre is inside each zone and whether
 * it moves against that zone's heading. Deterministic for a given scene (seeded). Used for tests and the demo.
 */
public final class SceneGenerator {
    /** Slower than this (pixels per second) a mover counts as standing, not as going the wrong way. */
    public static final double AGAINST_MIN_SPEED = 5;

    private final Scene scene;

    public SceneGenerator(Scene scene) {
        this.scene = scene;
    }

    /** Writes {@code video} (MP4) and {@code truth} (JSON). */
    public void write(Path video, Path truth) throws IOException {
        int w = scene.width();
        int h = scene.height();
        float[] background = Textures.background(scene, w, h, new SplittableRandom(scene.seed()));
        List<float[]> textures = new ArrayList<>();
        for (int i = 0; i < scene.movers().size(); i++) {
            Scene.Mover m = scene.movers().get(i);
            textures.add(Textures.mover(m.look(), pixels(m.width(), w), pixels(m.height(), h),
                    scene.seed() * 31 + i + 1));
        }
        float[] flickerWeight = flickerWeight(scene.nuisances().flicker(), w, h);
        double[] flickerKnots = flickerKnots(scene.nuisances().flicker(), scene.seconds(),
                new SplittableRandom(scene.seed() * 19 + 5));
        SplittableRandom noise = new SplittableRandom(scene.seed() ^ 0x5DEECE66DL);
        Scene.Nuisances nu = scene.nuisances();
        List<float[]> swayTextures = new ArrayList<>();
        for (int i = 0; i < nu.sways().size(); i++) {
            Scene.Sway sw = nu.sways().get(i);
            swayTextures.add(Textures.foliage(pixels(sw.width(), w), pixels(sw.height(), h), new SplittableRandom(scene.seed() * 97 + i)));
        }
        SplittableRandom rainRandom = new SplittableRandom(scene.seed() * 13 + 7);
        SplittableRandom shakeRandom = new SplittableRandom(scene.seed() * 17 + 3);
        double shakePhaseX = shakeRandom.nextDouble() * 2 * Math.PI;
        double shakePhaseY = shakeRandom.nextDouble() * 2 * Math.PI;
        float[] shifted = new float[w * h];
        float[] canvas = new float[w * h];
        byte[] bytes = new byte[w * h];
        ByteBuffer buffer = ByteBuffer.wrap(bytes);
        int frames = (int) Math.round(scene.seconds() * scene.fps());
        if (video.getParent() != null) {
            Files.createDirectories(video.getParent());
        }
        try (FFmpegFrameRecorder rec = new FFmpegFrameRecorder(video.toFile(), w, h, 0)) {
            rec.setFormat("mp4");
            rec.setVideoCodecName("libopenh264");
            rec.setFrameRate(scene.fps());
            rec.setGopSize((int) Math.round(scene.fps() * 2));
            rec.setVideoBitrate(scene.bitrateKbps() * 1000);
            rec.setPixelFormat(AV_PIX_FMT_YUV420P);
            rec.setVideoOption("threads", "1");
            rec.start();
            for (int f = 0; f < frames; f++) {
                double t = f / scene.fps();
                // the camera's own movement: shake (two sinusoids) and a lasting bump; the world shifts the other way
                double ox = 0;
                double oy = 0;
                if (nu.shakePx() > 0) {
                    ox += nu.shakePx() * Math.sin(2 * Math.PI * nu.shakeHz() * t + shakePhaseX);
                    oy += nu.shakePx() * Math.sin(2 * Math.PI * nu.shakeHz() * 1.37 * t + shakePhaseY);
                }
                if (nu.bump() != null && t >= nu.bump().atSeconds()) {
                    ox += nu.bump().dxPx();
                    oy += nu.bump().dyPx();
                }
                if (ox == 0 && oy == 0) {
                    System.arraycopy(background, 0, canvas, 0, canvas.length);
                } else {
                    shift(background, canvas, w, h, ox, oy);
                }
                for (int i = 0; i < nu.sways().size(); i++) {
                    Scene.Sway sw = nu.sways().get(i);
                    double a = sw.amplitudePx() * Math.sin(2 * Math.PI * t / sw.periodSeconds());
                    double ang = Math.toRadians(sw.angleDeg());
                    draw(canvas, w, h, swayTextures.get(i), pixels(sw.width(), w), pixels(sw.height(), h),
                            sw.x() * w + a * Math.sin(ang) - ox, sw.y() * h - a * Math.cos(ang) - oy);
                }
                for (int i = 0; i < scene.movers().size(); i++) {
                    Scene.Mover m = scene.movers().get(i);
                    if (t >= m.startSeconds() && t <= m.endSeconds()) {
                        double[] c = m.centreAt(t);
                        if (Scene.Look.NOISE.equals(m.look()) && m.ws() == null) {
                            // the first generator's drawing, kept so that older scenes render the very same
                            draw(canvas, w, h, textures.get(i), pixels(m.width(), w), pixels(m.height(), h),
                                    c[0] * w - ox, c[1] * h - oy);
                        } else {
                            double[] size = m.sizeAt(t);
                            drawSoft(canvas, w, h, textures.get(i), pixels(m.width(), w), pixels(m.height(), h),
                                    c[0] * w - ox, c[1] * h - oy, size[0] * w, size[1] * h);
                        }
                    }
                }
                if (nu.shadow() != null && t >= nu.shadow().startSeconds() && t <= nu.shadow().endSeconds()) {
                    shadow(canvas, w, h, nu.shadow(), t);
                }
                double[] light = light(nu.lights(), t);
                if (light[0] != 1 || light[1] != 0) {
                    for (int p = 0; p < canvas.length; p++) {
                        canvas[p] = (float) (canvas[p] * light[0] + light[1]);
                    }
                }
                if (nu.flicker() != null) {
                    double g = flickerGain(nu.flicker(), flickerKnots, t) - 1;
                    for (int p = 0; p < canvas.length; p++) {
                        canvas[p] = (float) (canvas[p] * (1 + g * (flickerWeight == null ? 1 : flickerWeight[p])));
                    }
                }
                for (Scene.Glare glare : nu.glares()) {
                    glare(canvas, w, h, glare, t, ox, oy);
                }
                if (nu.rain() != null) {
                    rain(canvas, w, h, nu.rain(), rainRandom);
                }
                Scene.Tamper tamper = nu.tamper();
                boolean tampered = tamper != null && t >= tamper.atSeconds();
                if (tampered && tamper.kind().equals("freeze")) {
                    buffer.rewind();
                    rec.recordImage(w, h, Frame.DEPTH_UBYTE, 1, w, AV_PIX_FMT_GRAY8, buffer); // the last picture again
                    continue;
                }
                if (tampered && tamper.kind().equals("cover")) {
                    java.util.Arrays.fill(canvas, 38f);
                }
                if (tampered && tamper.kind().equals("blur")) {
                    blur(canvas, shifted, w, h, 6);
                    blur(canvas, shifted, w, h, 6);
                }
                for (int p = 0; p < canvas.length; p++) {
                    double v = canvas[p] + scene.noise() * gaussian(noise);
                    int q = (int) Math.round(v);
                    bytes[p] = (byte) (q < 0 ? 0 : (q > 255 ? 255 : q));
                }
                buffer.rewind();
                rec.recordImage(w, h, Frame.DEPTH_UBYTE, 1, w, AV_PIX_FMT_GRAY8, buffer);
            }
            rec.stop();
        }
        TruthWriter.write(scene, truth, video.getFileName().toString());
    }

    /** The background seen by a camera moved by (ox, oy) pixels: bilinear, edges repeated. */
    private static void shift(float[] src, float[] dst, int w, int h, double ox, double oy) {
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
    private static void blur(float[] img, float[] tmp, int w, int h, int r) {
        for (int y = 0; y < h; y++) {
            for (int x = 0; x < w; x++) {
                double sum = 0;
                int n = 0;
                for (int k = Math.max(0, x - r); k <= Math.min(w - 1, x + r); k++) {
                    sum += img[y * w + k];
                    n++;
                }
                tmp[y * w + x] = (float) (sum / n);
            }
        }
        for (int y = 0; y < h; y++) {
            for (int x = 0; x < w; x++) {
                double sum = 0;
                int n = 0;
                for (int k = Math.max(0, y - r); k <= Math.min(h - 1, y + r); k++) {
                    sum += tmp[k * w + x];
                    n++;
                }
                img[y * w + x] = (float) (sum / n);
            }
        }
    }

    /** Gain and offset of the picture's brightness at t from the light changes (ramped linearly). */
    static double[] light(List<Scene.Light> lights, double t) {
        double gain = 1;
        double offset = 0;
        for (Scene.Light l : lights) {
            if (t < l.atSeconds()) {
                break;
            }
            double a = l.rampSeconds() <= 0 ? 1 : Math.min(1, (t - l.atSeconds()) / l.rampSeconds());
            gain += a * (l.gain() - gain);
            offset += a * (l.offset() - offset);
        }
        return new double[] {gain, offset};
    }

    /** A soft vertical band of shade (cos² across its width) at its place at t. */
    private static void shadow(float[] canvas, int w, int h, Scene.Shadow s, double t) {
        double a = (t - s.startSeconds()) / (s.endSeconds() - s.startSeconds());
        double centre = (s.fromX() + a * (s.toX() - s.fromX())) * w;
        double half = s.width() * w / 2;
        for (int x = Math.max(0, (int) (centre - half)); x < Math.min(w, (int) (centre + half) + 1); x++) {
            double d = (x + 0.5 - centre) / half;
            if (Math.abs(d) >= 1) {
                continue;
            }
            double c = Math.cos(d * Math.PI / 2);
            float factor = (float) (1 - s.darkness() * c * c);
            for (int y = 0; y < h; y++) {
                canvas[y * w + x] *= factor;
            }
        }
    }

    /** Short bright streaks at random places (new every frame). */
    private static void rain(float[] canvas, int w, int h, Scene.Rain r, SplittableRandom random) {
        double ang = Math.toRadians(r.angleDeg());
        double dx = Math.sin(ang);
        double dy = -Math.cos(ang);
        for (int k = 0; k < r.streaksPerFrame(); k++) {
            double x = random.nextDouble() * w;
            double y = random.nextDouble() * h;
            for (int step = 0; step < r.lengthPx(); step++) {
                int px = (int) (x + dx * step);
                int py = (int) (y + dy * step);
                if (px >= 0 && px < w && py >= 0 && py < h) {
                    canvas[py * w + px] += (float) r.brightness();
                }
            }
        }
    }

    private static int pixels(double fraction, int size) {
        return Math.max(4, (int) Math.round(fraction * size));
    }

    private static double gaussian(SplittableRandom r) {
        // Box–Muller; one value per call is enough here
        double u1 = 1.0 - r.nextDouble();
        double u2 = r.nextDouble();
        return Math.sqrt(-2 * Math.log(u1)) * Math.cos(2 * Math.PI * u2);
    }

    /** Draws a texture centred at (cx, cy) pixels with sub-pixel placement (bilinear sampling). */
    private static void draw(float[] canvas, int w, int h, float[] tex, int tw, int th, double cx, double cy) {
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
    private static void drawSoft(float[] canvas, int w, int h, float[] tex, int tw, int th, double cx, double cy,
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

    /** Per pixel weight of a local flicker (Gaussian pool of light), or null for the whole picture. */
    private static float[] flickerWeight(Scene.Flicker f, int w, int h) {
        if (f == null || Double.isNaN(f.radius())) {
            return null;
        }
        float[] weight = new float[w * h];
        double sigma = f.radius() * w;
        for (int y = 0; y < h; y++) {
            for (int x = 0; x < w; x++) {
                double dx = x + 0.5 - f.centreX() * w;
                double dy = y + 0.5 - f.centreY() * h;
                weight[y * w + x] = (float) Math.exp(-(dx * dx + dy * dy) / (2 * sigma * sigma));
            }
        }
        return weight;
    }

    /** The random flicker's levels, one per 1/hz s (null for mains flicker). */
    private static double[] flickerKnots(Scene.Flicker f, double seconds, SplittableRandom r) {
        if (f == null || !f.kind().equals("random")) {
            return null;
        }
        double[] k = new double[(int) Math.ceil(seconds * f.hz()) + 2];
        for (int i = 0; i < k.length; i++) {
            k[i] = (r.nextDouble() * 2 - 1) * f.amplitude();
        }
        return k;
    }

    /** The flicker's gain at t. */
    static double flickerGain(Scene.Flicker f, double[] knots, double t) {
        if (f.kind().equals("mains")) {
            return 1 + f.amplitude() * Math.sin(2 * Math.PI * f.hz() * t);
        }
        double k = t * f.hz();
        int i = (int) k;
        return 1 + knots[i] + (k - i) * (knots[i + 1] - knots[i]);
    }

    /** Adds a glare blob where it is at t (in the world: it moves with the picture when the camera does). */
    private void glare(float[] canvas, int w, int h, Scene.Glare g, double t, double ox, double oy) {
        double cx;
        double cy;
        if (g.moverId() != null) {
            Scene.Mover m = scene.movers().stream().filter(x -> x.id().equals(g.moverId())).findFirst().orElseThrow();
            if (t < m.startSeconds() || t > m.endSeconds()) {
                return;
            }
            double[] c = m.centreAt(t);
            cx = c[0] + g.dx();
            cy = c[1] + g.dy();
        } else {
            if (t < g.startSeconds() || t > g.endSeconds()) {
                return;
            }
            double a = (t - g.startSeconds()) / (g.endSeconds() - g.startSeconds());
            cx = g.fromX() + a * (g.toX() - g.fromX());
            cy = g.fromY() + a * (g.toY() - g.fromY());
        }
        double px = cx * w - ox;
        double py = cy * h - oy;
        double sigma = g.radius() * w;
        int reach = (int) Math.ceil(3 * sigma);
        for (int y = Math.max(0, (int) py - reach); y <= Math.min(h - 1, (int) py + reach); y++) {
            for (int x = Math.max(0, (int) px - reach); x <= Math.min(w - 1, (int) px + reach); x++) {
                double dx = x - px;
                double dy = y - py;
                canvas[y * w + x] += (float) (g.brightness() * Math.exp(-(dx * dx + dy * dy) / (2 * sigma * sigma)));
            }
        }
    }
}
