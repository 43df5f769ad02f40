#!/bin/bash
# One coilfront sweep split into 4 shards that GNU parallel runs side by side (on this machine, or on
# several with --sshloginfile); each shard gets 2 worker threads, 8 cores in all. {} is 1, 2, 3, 4.
parallel --jobs 4 --line-buffer coilfront sweep spec.yaml --out runs/night-shard-{} --shard {}/4 --workers 2 ::: 1 2 3 4

# After an interruption (Ctrl-C, a reboot), continue every shard from its checkpoint instead:
#   parallel --jobs 4 --line-buffer coilfront sweep --resume runs/night-shard-{} --workers 2 ::: 1 2 3 4

# Then one result, exactly as a single run over all samples would have written it:
coilfront merge runs/night-shard-{1..4} --out runs/night
