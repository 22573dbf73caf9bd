// Placeholder entry while the commands are wired; replaced by the real CLI.
process.stderr.write('railpulse: no commands yet\n');
process.exit(2);
