package wayward.scene;

import java.util.SplittableRandom;

/**
 * The pictures a scene is made of: the ground (a photograph or generated asphalt, with the painted lines), the
 * movers' looks (generated blocks, plain with a rim, or a patch of a photograph) and swaying foliage.
 */
final class Textures {
    private Textures() {
    }

    /** A mover's look at tw × th px; seed makes the generated ("noise") one. */
    static float[] mover(Scene.Look look, int tw, int th, long seed) {
        return switch (look.texture()) {
            case "plain" -> plain(tw, th, look);
            case "photo" -> photoPatch(look, tw, th);
            default -> noise(tw, th, new SplittableRandom(seed));
        };
    }

    /**
     * The ground: a real photograph (scene key background) scaled to cover the frame, centre-cropped, or
     * asphalt-like smooth value noise at a few scales with fine grain; then the painted lines.
     */
    static float[] background(Scene scene, int w, int h, SplittableRandom r) {
        if (scene.background() != null) {
            Photo p = Photo.load(scene.background());
            float[] img = new float[w * h];
            double scale = Math.max((double) w / p.width(), (double) h / p.height()); // frame px per photo px
            double x0 = (p.width() - w / scale) / 2;
            double y0 = (p.height() - h / scale) / 2;
            for (int y = 0; y < h; y++) {
                for (int x = 0; x < w; x++) {
                    img[y * w + x] = (float) p.area(x0 + (x + 0.5) / scale, y0 + (y + 0.5) / scale, 1 / scale);
                }
            }
            for (Scene.Line line : scene.lines()) {
                paintLine(img, w, h, line);
            }
            return img;
        }
        float[] img = new float[w * h];
        double[] amplitude = {28, 14, 7};
        int[] cell = {64, 16, 4};
        for (int o = 0; o < cell.length; o++) {
            int gw = w / cell[o] + 2;
            int gh = h / cell[o] + 2;
            double[] grid = new double[gw * gh];
            for (int i = 0; i < grid.length; i++) {
                grid[i] = r.nextDouble() * 2 - 1;
            }
            for (int y = 0; y < h; y++) {
                double gy = (double) y / cell[o];
                int y0 = (int) gy;
                double fy = smooth(gy - y0);
                for (int x = 0; x < w; x++) {
                    double gx = (double) x / cell[o];
                    int x0 = (int) gx;
                    double fx = smooth(gx - x0);
                    double a = grid[y0 * gw + x0] + fx * (grid[y0 * gw + x0 + 1] - grid[y0 * gw + x0]);
                    double b = grid[(y0 + 1) * gw + x0] + fx * (grid[(y0 + 1) * gw + x0 + 1] - grid[(y0 + 1) * gw + x0]);
                    img[y * w + x] += (float) (amplitude[o] * (a + fy * (b - a)));
                }
            }
        }
        for (int i = 0; i < img.length; i++) {
            img[i] += 100;
        }
        for (Scene.Line line : scene.lines()) {
            paintLine(img, w, h, line);
        }
        return img;
    }

    private static double smooth(double f) {
        return f * f * (3 - 2 * f);
    }

    private static void paintLine(float[] img, int w, int h, Scene.Line line) {
        double x0 = line.x0() * w;
        double y0 = line.y0() * h;
        double x1 = line.x1() * w;
        double y1 = line.y1() * h;
        double len = Math.hypot(x1 - x0, y1 - y0);
        double half = line.widthPx() / 2.0;
        for (int y = 0; y < h; y++) {
            for (int x = 0; x < w; x++) {
                double px = x + 0.5 - x0;
                double py = y + 0.5 - y0;
                double along = (px * (x1 - x0) + py * (y1 - y0)) / len;
                double across = Math.abs(px * (y1 - y0) - py * (x1 - x0)) / len;
                if (along < 0 || along > len || across > half + 0.5) {
                    continue;
                }
                if (line.dashPx() > 0 && ((int) (along / line.dashPx()) & 1) == 1) {
                    continue;
                }
                double cover = Math.min(1, half + 0.5 - across);
                img[y * w + x] += (float) (cover * (215 - img[y * w + x]));
            }
        }
    }

    /** A mover's look: a dark frame around blocks of varied brightness with fine detail, like a loaded cart. */
    private static float[] noise(int tw, int th, SplittableRandom r) {
        float[] t = new float[tw * th];
        int block = Math.max(3, Math.min(tw, th) / 5);
        int bw = tw / block + 1;
        int bh = th / block + 1;
        double[] blocks = new double[bw * bh];
        for (int i = 0; i < blocks.length; i++) {
            blocks[i] = 60 + r.nextDouble() * 170;
        }
        for (int y = 0; y < th; y++) {
            for (int x = 0; x < tw; x++) {
                double v = blocks[(y / block) * bw + x / block] + (r.nextDouble() - 0.5) * 50;
                if (x < 2 || y < 2 || x >= tw - 2 || y >= th - 2) {
                    v = 25;
                }
                t[y * tw + x] = (float) v;
            }
        }
        return t;
    }

    /** A flat grey box with an optional darker rim, like a van's roof seen from above. */
    private static float[] plain(int tw, int th, Scene.Look look) {
        float[] t = new float[tw * th];
        for (int y = 0; y < th; y++) {
            for (int x = 0; x < tw; x++) {
                boolean rim = x < look.rimPx() || y < look.rimPx() || x >= tw - look.rimPx() || y >= th - look.rimPx();
                t[y * tw + x] = (float) (rim ? look.rimGrey() : look.grey());
            }
        }
        return t;
    }

    /** A tw × th patch of a photograph, centred at the look's place in it, photoScale photo px per px. */
    private static float[] photoPatch(Scene.Look look, int tw, int th) {
        Photo p = Photo.load(look.photo());
        float[] t = new float[tw * th];
        double s = look.photoScale();
        double cx = look.photoX() * p.width();
        double cy = look.photoY() * p.height();
        for (int y = 0; y < th; y++) {
            for (int x = 0; x < tw; x++) {
                t[y * tw + x] = (float) p.area(cx + (x + 0.5 - tw / 2.0) * s, cy + (y + 0.5 - th / 2.0) * s, s);
            }
        }
        return t;
    }

    /** Leaves: a random grey from 70 to 180 in every pixel. */
    static float[] foliage(int tw, int th, SplittableRandom r) {
        float[] t = new float[tw * th];
        for (int i = 0; i < t.length; i++) {
            t[i] = (float) (70 + r.nextDouble() * 110);
        }
        return t;
    }
}
