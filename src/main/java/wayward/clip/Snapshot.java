package wayward.clip;

import java.awt.BasicStroke;
import java.awt.Color;
import java.awt.Graphics2D;
import java.awt.Polygon;
import java.awt.RenderingHints;
import java.awt.image.BufferedImage;
import wayward.flow.FlowField;
import wayward.image.GrayFrame;
import wayward.picture.FlowColours;

/**
 * The picture of an event's trigger: the analysis frame (gray, shown at twice its size), the zone's outline,
 * and an arrow per moving flow sample inside the zone, coloured by direction with the Baker et al. (2011) colour
 * wheel. Drawn on the analysis thread at the event's start (it copies what it needs from the reused buffers);
 * encoding and writing happen elsewhere.
 */
public final class Snapshot {
    private static final int SCALE = 2;

    private Snapshot() {
    }

    /**
     * @param xs             zone corners' x as fractions of the width
     * @param ys             zone corners' y as fractions of the height
     * @param minStepPixels  shortest displacement drawn, analysis pixels per frame pair
     */
    public static BufferedImage draw(GrayFrame frame, FlowField flow, double[] xs, double[] ys, double minStepPixels) {
        return draw(frame, flow, xs, ys, minStepPixels, null);
    }

    /**
     * As {@link #draw(GrayFrame, FlowField, double[], double[], double)}, with the mover's path on top: a line
     * through its centroid points (picture fractions, x and y interleaved; null for none), a hollow circle where
     * it was first seen and a filled one where it was when the event started, in white on a black casing.
     */
    public static BufferedImage draw(GrayFrame frame, FlowField flow, double[] xs, double[] ys, double minStepPixels,
            double[] path) {
        BufferedImage img = gray(frame);
        Polygon zone = polygon(xs, ys, frame);
        Graphics2D g = graphics(img);
        outline(g, zone);
        arrows(g, flow, zone, minStepPixels);
        if (path != null && path.length >= 2) {
            path(g, path, frame);
        }
        g.dispose();
        return img;
    }

    private static void path(Graphics2D g, double[] path, GrayFrame frame) {
        int n = path.length / 2;
        int[] x = new int[n];
        int[] y = new int[n];
        for (int i = 0; i < n; i++) {
            x[i] = (int) Math.round(path[2 * i] * frame.width * SCALE);
            y[i] = (int) Math.round(path[2 * i + 1] * frame.height * SCALE);
        }
        for (int pass = 0; pass < 2; pass++) {
            g.setStroke(new BasicStroke(pass == 0 ? 5f : 2.5f, BasicStroke.CAP_ROUND, BasicStroke.JOIN_ROUND));
            g.setColor(pass == 0 ? Color.BLACK : Color.WHITE);
            g.drawPolyline(x, y, n);
            g.drawOval(x[0] - 5, y[0] - 5, 10, 10);
            g.fillOval(x[n - 1] - 5, y[n - 1] - 5, 10, 10);
        }
    }

    /**
     * The live view: the frame, every zone's outline with its permitted heading as a white arrow from its
     * centre, and the flow arrows of the whole picture.
     *
     * @param headings per zone, degrees clockwise from image-up, NaN for none
     */
    public static BufferedImage live(GrayFrame frame, FlowField flow, java.util.List<double[]> xs,
            java.util.List<double[]> ys, double[] headings, double minStepPixels) {
        BufferedImage img = gray(frame);
        Graphics2D g = graphics(img);
        arrows(g, flow, null, minStepPixels);
        for (int z = 0; z < xs.size(); z++) {
            Polygon p = polygon(xs.get(z), ys.get(z), frame);
            outline(g, p);
            if (!Double.isNaN(headings[z])) {
                double cx = 0;
                double cy = 0;
                for (int i = 0; i < p.npoints; i++) {
                    cx += p.xpoints[i];
                    cy += p.ypoints[i];
                }
                cx /= p.npoints;
                cy /= p.npoints;
                double a = Math.toRadians(headings[z]);
                double len = 20 * SCALE;
                double ex = cx + len * Math.sin(a);
                double ey = cy - len * Math.cos(a);
                g.setStroke(new BasicStroke(3f));
                g.setColor(Color.WHITE);
                g.drawLine((int) cx, (int) cy, (int) ex, (int) ey);
                double back = Math.atan2(ey - cy, ex - cx);
                for (double side : new double[] {-0.5, 0.5}) {
                    g.drawLine((int) ex, (int) ey, (int) Math.round(ex - 10 * Math.cos(back + side)),
                            (int) Math.round(ey - 10 * Math.sin(back + side)));
                }
            }
        }
        g.dispose();
        return img;
    }

    private static BufferedImage gray(GrayFrame frame) {
        int w = frame.width;
        int h = frame.height;
        BufferedImage img = new BufferedImage(w * SCALE, h * SCALE, BufferedImage.TYPE_INT_RGB);
        for (int y = 0; y < h * SCALE; y++) {
            for (int x = 0; x < w * SCALE; x++) {
                int g = frame.pixels[(y / SCALE) * w + x / SCALE] & 0xff;
                img.setRGB(x, y, (g << 16) | (g << 8) | g);
            }
        }
        return img;
    }

    private static Polygon polygon(double[] xs, double[] ys, GrayFrame frame) {
        Polygon zone = new Polygon();
        for (int i = 0; i < xs.length; i++) {
            zone.addPoint((int) Math.round(xs[i] * frame.width * SCALE), (int) Math.round(ys[i] * frame.height * SCALE));
        }
        return zone;
    }

    private static Graphics2D graphics(BufferedImage img) {
        Graphics2D g = img.createGraphics();
        g.setRenderingHint(RenderingHints.KEY_ANTIALIASING, RenderingHints.VALUE_ANTIALIAS_ON);
        return g;
    }

    private static void outline(Graphics2D g, Polygon zone) {
        g.setStroke(new BasicStroke(3f));
        g.setColor(Color.BLACK);
        g.drawPolygon(zone);
        g.setStroke(new BasicStroke(1.5f));
        g.setColor(Color.WHITE);
        g.drawPolygon(zone);
    }

    /** An arrow per moving sample (inside {@code zone}, or everywhere when null), coloured by direction. */
    private static void arrows(Graphics2D g, FlowField flow, Polygon zone, double minStepPixels) {
        double max = 1e-6;
        for (int k = 0; k < flow.u.length; k++) {
            max = Math.max(max, Math.hypot(flow.u[k] - flow.globalU, flow.v[k] - flow.globalV));
        }
        g.setStroke(new BasicStroke(1.5f));
        // every other sample each way: arrows readable, not a solid mat
        for (int j = 0; j < flow.height; j += 2) {
            for (int i = 0; i < flow.width; i += 2) {
                int k = j * flow.width + i;
                double du = flow.u[k] - flow.globalU;
                double dv = flow.v[k] - flow.globalV;
                int px = flow.pixelX(i) * SCALE + SCALE / 2;
                int py = flow.pixelY(j) * SCALE + SCALE / 2;
                if (Math.hypot(du, dv) < minStepPixels || (zone != null && !zone.contains(px, py))) {
                    continue;
                }
                g.setColor(new Color(FlowColours.rgb(du / max, dv / max)));
                // arrows at twice the displacement so frame-to-frame motion is visible
                double ex = px + 2 * SCALE * du;
                double ey = py + 2 * SCALE * dv;
                g.drawLine(px, py, (int) Math.round(ex), (int) Math.round(ey));
                double a = Math.atan2(dv, du);
                for (double side : new double[] {-0.5, 0.5}) {
                    g.drawLine((int) Math.round(ex), (int) Math.round(ey),
                            (int) Math.round(ex - 4 * Math.cos(a + side)), (int) Math.round(ey - 4 * Math.sin(a + side)));
                }
            }
        }
    }
}
