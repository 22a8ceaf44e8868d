package wayward.delivery;

import java.io.IOException;
import java.net.InetSocketAddress;
import java.net.ServerSocket;
import java.net.Socket;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.ThreadLocalRandom;
import java.util.concurrent.TimeUnit;

/**
 * A real MQTT broker for tests: Debian's Mosquitto (2.0), run in the foreground on a loopback port with a
 * config written here, stopped and started again on the same port. Its command-line clients serve as an
 * independent MQTT 3.1.1 implementation to check what arrives.
 */
public final class Mosquitto implements AutoCloseable {
    public static final String BROKER = Files.isExecutable(Path.of("/usr/sbin/mosquitto")) ? "/usr/sbin/mosquitto"
            : "mosquitto";
    private final Path dir;
    private final int port;
    private final List<String> extra;
    private Process process;

    /**
     * @param extra config lines besides the listener (e.g. TLS files, password_file); with none, anonymous
     *              access. Persistence is on, so queued messages of persistent sessions survive a restart.
     */
    public Mosquitto(Path dir, List<String> extra) throws IOException {
        this.dir = dir;
        this.port = freePort();
        this.extra = List.copyOf(extra);
        Files.createDirectories(dir);
    }

    public int port() {
        return port;
    }

    /**
     * A free loopback port below the ephemeral range, so no client socket can get it as its own port while
     * the broker is down (which would make connecting to it connect a socket to itself).
     */
    public static int freePort() throws IOException {
        for (int i = 0; i < 200; i++) {
            int p = 20000 + ThreadLocalRandom.current().nextInt(12000);
            try (ServerSocket s = new ServerSocket()) {
                s.bind(new InetSocketAddress("127.0.0.1", p));
                return p;
            } catch (IOException busy) {
                // try another
            }
        }
        throw new IOException("no free port between 20000 and 32000");
    }

    public Mosquitto start() throws IOException, InterruptedException {
        List<String> conf = new ArrayList<>();
        conf.add("listener " + port + " 127.0.0.1");
        conf.add("user root"); // CI runs as root; stay so, to read the test's files
        conf.add("persistence true");
        conf.add("persistence_location " + dir + "/");
        boolean auth = extra.stream().anyMatch(l -> l.startsWith("password_file"));
        conf.add("allow_anonymous " + !auth);
        conf.addAll(extra);
        Path file = dir.resolve("mosquitto.conf");
        Files.write(file, conf, StandardCharsets.UTF_8);
        process = new ProcessBuilder(BROKER, "-c", file.toString())
                .redirectErrorStream(true)
                .redirectOutput(ProcessBuilder.Redirect.appendTo(dir.resolve("mosquitto.log").toFile()))
                .start();
        long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(10);
        while (System.nanoTime() < deadline) {
            if (!process.isAlive()) {
                throw new IOException("mosquitto ended at start: " + log());
            }
            try (Socket s = new Socket("127.0.0.1", port)) {
                return this;
            } catch (IOException notYet) {
                Thread.sleep(50);
            }
        }
        throw new IOException("mosquitto did not listen on " + port + ": " + log());
    }

    /** Kills the broker (SIGKILL: no goodbye, no will sent, as when its host dies) and waits for it. */
    public void kill() throws InterruptedException {
        if (process != null && process.isAlive()) {
            process.destroyForcibly().waitFor();
        }
    }

    /** Stops the broker (SIGTERM: it saves its database) and waits for it. */
    public void stop() throws InterruptedException {
        if (process != null && process.isAlive()) {
            process.destroy();
            if (!process.waitFor(10, TimeUnit.SECONDS)) {
                process.destroyForcibly().waitFor();
            }
        }
    }

    public String log() {
        try {
            return Files.readString(dir.resolve("mosquitto.log"));
        } catch (IOException e) {
            return "(no log: " + e + ")";
        }
    }

    @Override
    public void close() throws InterruptedException {
        stop();
    }

    /** Runs a mosquitto client to its end, with a time limit; returns standard output lines. */
    public static List<String> client(long timeoutSeconds, String... command) throws IOException, InterruptedException {
        Process p = new ProcessBuilder(command).redirectErrorStream(true).start();
        if (!p.waitFor(timeoutSeconds, TimeUnit.SECONDS)) {
            p.destroyForcibly();
        }
        return List.of(new String(p.getInputStream().readAllBytes(), StandardCharsets.UTF_8).split("\n"));
    }

    /** What is retained below {@code filter} now, as "topic payload" lines (mosquitto_sub --retained-only). */
    public List<String> retained(String filter, String... options) throws IOException, InterruptedException {
        List<String> cmd = new ArrayList<>(List.of("mosquitto_sub", "-h", "127.0.0.1", "-p", Integer.toString(port),
                "-t", filter, "-v", "--retained-only", "-W", "2"));
        cmd.addAll(List.of(options));
        List<String> out = new ArrayList<>();
        for (String l : client(10, cmd.toArray(String[]::new))) {
            if (!l.isBlank() && !l.startsWith("Timed out")) {
                out.add(l);
            }
        }
        return out;
    }
}
