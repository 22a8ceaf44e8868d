package wayward.scene;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;

/** A photograph from Debian's opencv-doc examples, as grey levels (ITU-R BT.601 luma weights). */
record Photo(int width, int height, float[] grey) {
    static Photo load(String name) {
        Path file = Scene.photoFolder().resolve(name);
        if (!Files.isRegularFile(file)) {
            throw new IllegalArgumentException("photo " + name + ": " + file + " not found (the scene's "
                    + "photographs come from Debian's opencv-doc package: apt-get install opencv-doc)");
        }
        java.awt.image.BufferedImage img;
        try {
            img = javax.imageio.ImageIO.read(file.toFile());
        } catch (IOException e) {
            throw new IllegalArgumentException("photo " + name + ": " + file + ": " + e.getMessage(), e);
        }
        if (img == null) {
            throw new IllegalArgumentException("photo " + name + ": " + file + ": not a picture ImageIO reads");
        }
        float[] g = new float[img.getWidth() * img.getHeight()];
        for (int y = 0; y < img.getHeight(); y++) {
            for (int x = 0; x < img.getWidth(); x++) {
                int rgb = img.getRGB(x, y);
                g[y * img.getWidth() + x] = (float) (0.299 * ((rgb >> 16) & 0xff) + 0.587 * ((rgb >> 8) & 0xff)
                        + 0.114 * (rgb & 0xff));
            }
        }
        return new Photo(img.getWidth(), img.getHeight(), g);
    }

    /** Mean over a footprint × footprint square centred at (x, y) (photo px; edges repeated). */
    double area(double x, double y, double footprint) {
        int n = Math.max(1, (int) Math.ceil(footprint));
        double sum = 0;
        for (int j = 0; j < n; j++) {
            for (int i = 0; i < n; i++) {
                sum += bilinear(x - 0.5 + (i + 0.5 - n / 2.0) * footprint / n, y - 0.5 + (j + 0.5 - n / 2.0) * footprint / n);
            }
        }
        return sum / (n * n);
    }

    private double bilinear(double x, double y) {
        double sx = Math.max(0, Math.min(width - 1.001, x));
        double sy = Math.max(0, Math.min(height - 1.001, y));
        int x0 = (int) sx;
        int y0 = (int) sy;
        double fx = sx - x0;
        double fy = sy - y0;
        int i = y0 * width + x0;
        double a = grey[i] + fx * (grey[i + 1] - grey[i]);
        double b = grey[i + width] + fx * (grey[i + width + 1] - grey[i + width]);
        return a + fy * (b - a);
    }
}
