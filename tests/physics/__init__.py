"""Physics modules against published values and reference libraries."""
