"""What users write and what the library knows: project sections, factor sets, rulebooks, units, reference values."""
