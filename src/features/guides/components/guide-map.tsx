// The map: the same draft drawn as a graph (laid out top to bottom by dagre); clicking a step
// selects it in the outline and opens its form.
import dagre from '@dagrejs/dagre';
import { Background, Controls, Handle, Position, ReactFlow, type Edge, type Node, type NodeProps } from '@xyflow/react';
import '@xyflow/react/dist/style.css';
import { memo, useMemo } from 'react';
import { branchesOf, type DraftStep } from '@/shared/guides';
import { StepKindBadge } from './step-kind';
import { branchWords, type Content } from '../utils/outline';

const W = 220;
const H = 72;

type StepNodeData = { step: DraftStep; start: boolean; problems: number; selected: boolean };

const StepNode = memo(function StepNode({ data }: NodeProps<Node<StepNodeData>>) {
  const { step, start, problems, selected } = data;
  return (
    <div className={`w-[220px] rounded-md border-2 bg-paper-raised px-2 py-1.5 text-left text-sm shadow-sm ${selected ? 'border-amber' : problems ? 'border-danger' : 'border-rule-strong'}`}>
      <Handle type="target" position={Position.Top} className="!bg-rule-strong" />
      <div className="flex items-center gap-1">
        <StepKindBadge kind={step.kind} />
        {start ? <span className="rounded bg-paper-sunk px-1 text-xs">start</span> : null}
        {problems ? <span className="ml-auto rounded bg-danger-wash px-1 text-xs font-semibold text-danger-deep">{problems}</span> : null}
      </div>
      <p className="mt-1 line-clamp-2 leading-snug">{step.title || <span className="text-ink-faint">Untitled</span>}</p>
      <Handle type="source" position={Position.Bottom} className="!bg-rule-strong" />
    </div>
  );
});

const nodeTypes = { step: StepNode };

export function GuideMap({ content, selected, problemCounts, onSelect }: { content: Content; selected: string | null; problemCounts: Map<string, number>; onSelect: (id: string) => void }) {
  const { nodes, edges } = useMemo(() => {
    const g = new dagre.graphlib.Graph();
    g.setGraph({ rankdir: 'TB', nodesep: 30, ranksep: 60 });
    g.setDefaultEdgeLabel(() => ({}));
    const ids = new Set(content.steps.map((s) => s.id));
    for (const s of content.steps) g.setNode(s.id, { width: W, height: H });
    const edges: Edge[] = [];
    for (const s of content.steps) {
      branchesOf(s).forEach((b, k) => {
        if (!b.next || !ids.has(b.next)) return;
        g.setEdge(s.id, b.next);
        edges.push({ id: `${s.id}-${k}-${b.next}`, source: s.id, target: b.next, label: branchWords(s, k), labelBgPadding: [4, 2], labelStyle: { fontSize: 11 }, style: { strokeWidth: 1.5 } });
      });
    }
    dagre.layout(g);
    const nodes: Node<StepNodeData>[] = content.steps.map((s) => {
      const p = g.node(s.id);
      return {
        id: s.id,
        type: 'step',
        position: { x: (p?.x ?? 0) - W / 2, y: (p?.y ?? 0) - H / 2 },
        data: { step: s, start: content.startStepId === s.id, problems: problemCounts.get(s.id) ?? 0, selected: selected === s.id },
        draggable: false,
        connectable: false,
      };
    });
    return { nodes, edges };
  }, [content, selected, problemCounts]);

  return (
    <div className="h-[28rem] rounded-md border border-rule bg-paper lg:h-[36rem]" aria-label="Guide map" role="figure">
      <ReactFlow nodes={nodes} edges={edges} nodeTypes={nodeTypes} onNodeClick={(_, n) => onSelect(n.id)} fitView minZoom={0.2} nodesConnectable={false}>
        <Background gap={24} color="#D8CFBF" />
        <Controls showInteractive={false} />
      </ReactFlow>
    </div>
  );
}
