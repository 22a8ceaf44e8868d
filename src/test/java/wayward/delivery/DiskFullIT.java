package wayward.delivery;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import wayward.event.Event;
import wayward.event.EventJson;
import wayward.event.EventKind;
import wayward.testing.SchemaCheck;

/**
 * A disk that really fills: a 256 KiB tmpfs (Linux; mounting needs root: run with sudo, as .ci/run is) holding the outbox
 * and the event log. While it is full, appends fail and nothing is accepted; once space comes back, every phase
 * written before and after reads back in order, none damaged, and the event log holds whole lines only.
 */
class DiskFullIT {
    @TempDir
    Path root;
    private Path mount;
    private boolean mounted;

    private static void run(String... command) throws IOException, InterruptedException {
        Process p = new ProcessBuilder(command).redirectErrorStream(true).start();
        String out = new String(p.getInputStream().readAllBytes(), StandardCharsets.UTF_8);
        if (p.waitFor() != 0) {
            throw new IOException(String.join(" ", command) + ": " + out);
        }
    }

    @AfterEach
    void unmount() throws Exception {
        if (mounted) {
            run("umount", mount.toString());
        }
    }

    private static Event phase(int i) {
        return new Event("id-" + i, "yard-mast-2", "lane-2-out", EventKind.WRONG_WAY,
                i % 2 == 0 ? Event.Phase.START : Event.Phase.END, i, Instant.parse("2026-12-03T08:00:00Z"), 180, 45,
                0.04, Double.NaN);
    }

    @Test
    void aFullDiskLosesNothingAcceptedAndSplicesNothing() throws Exception {
        mount = Files.createDirectories(root.resolve("small-disk"));
        // fails with mount's own reason when not run as root (the README's test command runs as root)
        run("mount", "-t", "tmpfs", "-o", "size=256k", "tmpfs", mount.toString());
        mounted = true;
        Path data = mount.resolve("data");
        EventLog log = new EventLog(data);
        List<Integer> accepted = new ArrayList<>();
        try (Outbox o = Outbox.open(data.resolve("outbox"), 1 << 20, 1 << 20)) {
            int i = 0;
            for (; i < 5; i++) {
                o.append(List.of(EventJson.toJson(phase(i)).getBytes(StandardCharsets.UTF_8)));
                log.deliver(phase(i));
                accepted.add(i);
            }
            // something else fills the disk
            Path filler = mount.resolve("filler");
            try (var out = Files.newOutputStream(filler)) {
                byte[] block = new byte[4096];
                while (true) {
                    out.write(block);
                }
            } catch (IOException full) {
                // no space left on device
            }
            int failures = 0;
            boolean logRefused = false;
            for (; i < 200 && failures < 3; i++) {
                byte[] record = EventJson.toJson(phase(i)).getBytes(StandardCharsets.UTF_8);
                try {
                    o.append(List.of(record));
                    accepted.add(i);
                } catch (IOException e) {
                    failures++;
                    try {
                        log.deliver(phase(i)); // the log's last page may still have room; if not, it holds the line
                    } catch (java.io.UncheckedIOException held) {
                        logRefused = true;
                    }
                    break;
                }
                log.deliver(phase(i));
            }
            assertTrue(failures > 0, "the disk never filled");
            System.out.println("outbox refused phase " + i + "; the event log " + (logRefused ? "held it" : "still had room"));
            int failedAt = i;
            Files.delete(filler);
            // space is back: the writer tries the refused phase again, then goes on
            for (i = failedAt; i < failedAt + 5; i++) {
                o.append(List.of(EventJson.toJson(phase(i)).getBytes(StandardCharsets.UTF_8)));
                if (i > failedAt) {
                    log.deliver(phase(i));
                }
                accepted.add(i);
            }
            List<Integer> read = new ArrayList<>();
            Outbox.Reader r = o.reader(1);
            for (Outbox.Entry e; (e = r.next(0, TimeUnit.MILLISECONDS)) != null; ) {
                SchemaCheck.assertEventRecord(new String(e.payload(), StandardCharsets.UTF_8));
                read.add((int) EventJson.parse(e.payload()).streamSeconds());
            }
            r.close();
            assertEquals(accepted, read, "every accepted phase once, in order, none damaged");
        }
        List<Integer> logged = new ArrayList<>();
        for (String line : Files.readAllLines(log.file(), StandardCharsets.UTF_8)) {
            SchemaCheck.assertEventRecord(line);
            logged.add((int) EventJson.parse(line.getBytes(StandardCharsets.UTF_8)).streamSeconds()); // whole lines
        }
        assertEquals(accepted, logged, "the event log holds every phase once, the held one written when space came");
    }
}
